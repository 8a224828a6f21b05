/** Containers: bins, bags, boxes, shelves and carts, each an item with its own chain of custody. */
import { z } from 'zod';
import { codeSchemaFor } from '../domain/codes';
import { CONTAINER_STATES } from '../domain/ledger/state-machine';

/** The kinds of container a lab registers. */
export const CONTAINER_TYPE_VALUES = ['bin', 'bag', 'box', 'shelf', 'cart'] as const;

/** POST /api/containers. */
export const ContainerCreateSchema = z
  .strictObject({
    containerType: z.enum(CONTAINER_TYPE_VALUES, { error: 'Choose a container type: bin, bag, box, shelf or cart.' }),
    name: z
      .string({ error: 'Give the container a name people can find it by, such as "Cell 2 bin A".' })
      .trim()
      .min(1, { error: 'Give the container a name people can find it by, such as "Cell 2 bin A".' })
      .max(120, { error: 'Keep the name under 120 characters.' }),
    /** A bin at a test cell that takes only one half (A also takes unbroken specimens). */
    binHalf: z.enum(['A', 'B'], { error: 'A bin takes half A or half B.' }).nullish(),
    /** The container it is placed in (a bag in a box, a box on a shelf). */
    containerCode: codeSchemaFor('container').nullish(),
    stationCode: z.string().trim().min(1).max(64).optional(),
    /** A key the client may retry with; the server makes one when left out. */
    idempotencyKey: z.string().trim().min(1).max(200).optional(),
  })
  .refine((body) => body.binHalf == null || body.containerType === 'bin', {
    error: 'Only a bin is marked for half A or half B.',
    path: ['binHalf'],
  });

/** A validated POST /api/containers body. */
export type ContainerCreate = z.infer<typeof ContainerCreateSchema>;

/** GET /api/containers: search by code or name, filter by type and state, page. */
export const ContainerListQuerySchema = z.object({
  q: z.string().trim().max(120).optional(),
  type: z.enum(CONTAINER_TYPE_VALUES, { error: 'Filter by a container type: bin, bag, box, shelf or cart.' }).optional(),
  state: z.enum([...CONTAINER_STATES, 'none'], { error: 'Filter by a container state: active, in_transit or disposed.' }).optional(),
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(50),
});

/** A validated container list query. */
export type ContainerListQuery = z.infer<typeof ContainerListQuerySchema>;
