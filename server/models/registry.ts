import type { Sequelize } from 'sequelize';
import { defineUser } from './user';
import { defineStation } from './station';
import { defineInstrumentToken } from './instrument-token';
import { defineOneTimeToken } from './one-time-token';
import { defineSignatureToken } from './signature-token';
import { defineCustomer } from './customer';
import { defineOrder } from './order';
import { defineHeat } from './heat';
import { defineSample } from './sample';

/**
 * The models bound to one connection. Each app context gets its own set, so tests can run
 * several apps on several databases in one process.
 */
export function defineModels(sequelize: Sequelize) {
  return {
    User: defineUser(sequelize),
    Station: defineStation(sequelize),
    InstrumentToken: defineInstrumentToken(sequelize),
    OneTimeToken: defineOneTimeToken(sequelize),
    SignatureToken: defineSignatureToken(sequelize),
    Customer: defineCustomer(sequelize),
    Order: defineOrder(sequelize),
    Heat: defineHeat(sequelize),
    Sample: defineSample(sequelize),
  };
}

export type Models = ReturnType<typeof defineModels>;
