/**
 * The specifications routes: the body of POST /api/specifications is the shared
 * SpecificationInputSchema (the form and the server check the same object); the answers below.
 */
import { z } from 'zod';
import { SpecificationInputSchema, type Specification } from '../domain/tensile/specifications';

/** POST /api/specifications. */
export const SpecificationCreateSchema = SpecificationInputSchema;
/** The body. */
export type SpecificationCreate = z.input<typeof SpecificationCreateSchema>;

/** A specification as the API shows it: built in (with where its values were read) or added by a lab. */
export type SpecificationView = Specification & {
  builtIn: boolean;
  createdAt: string | null;
  createdBy: string | null;
};

/** GET /api/specifications. */
export interface SpecificationList {
  items: SpecificationView[];
  canWrite: boolean;
}

/** GET /api/specifications/:key params. */
export const SpecificationKeyParamsSchema = z.object({ key: z.string().trim().min(1).max(60) });
