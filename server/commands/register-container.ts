import { QueryTypes, type Transaction } from 'sequelize';
import { containerCode } from '../../shared/domain/codes';
import type { AppContext } from '../app';
import type { ContainerType } from '../ledger/container-rules';
import { registerItem, type LedgerActor } from './record-event';

/** A container to register: a bin, bag, box, shelf or cart. */
export interface NewContainer {
  containerType: ContainerType;
  name: string;
  binHalf?: 'A' | 'B' | null;
  stationCode?: string;
  /** The container it starts in (a bag in a box), if any. */
  containerCode?: string | null;
  idempotencyKey?: string;
}

/**
 * Registers a container: takes the next container serial, makes its check-character code,
 * inserts the item with its `registered` event and the containers row, in one transaction.
 */
export async function registerContainer(
  ctx: AppContext,
  container: NewContainer,
  opts: { actor: LedgerActor; transaction?: Transaction },
): Promise<string> {
  const run = async (transaction: Transaction) => {
    const [next] = await ctx.sequelize.query<{ serial: string }>(`SELECT nextval('container_serial_seq') AS serial`, {
      transaction,
      type: QueryTypes.SELECT,
    });
    const serial = Number(next?.serial);
    const code = containerCode(serial);
    const { itemId } = await registerItem(
      ctx,
      {
        kind: 'container',
        code,
        stationCode: container.stationCode,
        containerCode: container.containerCode ?? null,
        idempotencyKey: container.idempotencyKey,
        payload: { containerType: container.containerType, name: container.name, ...(container.binHalf ? { binHalf: container.binHalf } : {}) },
      },
      { actor: opts.actor, transaction },
    );
    await ctx.sequelize.query('INSERT INTO containers (item_id, serial, container_type, name, bin_half) VALUES ($1, $2, $3, $4, $5)', {
      bind: [itemId, serial, container.containerType, container.name, container.binHalf ?? null],
      transaction,
    });
    return code;
  };
  return opts.transaction ? run(opts.transaction) : ctx.sequelize.transaction(run);
}
