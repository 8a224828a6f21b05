import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

/** A station-bound token an instrument posts events with; only its SHA-256 and a short prefix are kept. */
export class InstrumentToken extends Model<InferAttributes<InstrumentToken>, InferCreationAttributes<InstrumentToken>> {
  declare id: CreationOptional<number>;
  declare stationId: number;
  declare name: string;
  declare tokenHash: string;
  declare tokenPrefix: string;
  declare eventTypes: string[];
  declare createdBy: number | null;
  declare createdAt: CreationOptional<Date>;
  declare revokedAt: Date | null;
  declare lastUsedAt: Date | null;
}

/** Binds the InstrumentToken model to one connection. */
export function defineInstrumentToken(sequelize: Sequelize): typeof InstrumentToken {
  const M = class extends InstrumentToken {};
  M.init(
    {
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      stationId: { type: DataTypes.INTEGER, allowNull: false },
      name: { type: DataTypes.TEXT, allowNull: false },
      tokenHash: { type: DataTypes.TEXT, allowNull: false },
      tokenPrefix: { type: DataTypes.TEXT, allowNull: false },
      eventTypes: { type: DataTypes.ARRAY(DataTypes.TEXT), allowNull: false },
      createdBy: { type: DataTypes.INTEGER, allowNull: true },
      createdAt: DataTypes.DATE,
      revokedAt: { type: DataTypes.DATE, allowNull: true },
      lastUsedAt: { type: DataTypes.DATE, allowNull: true },
    },
    { sequelize, tableName: 'instrument_tokens', modelName: 'InstrumentToken', underscored: true, updatedAt: false },
  );
  return M;
}
