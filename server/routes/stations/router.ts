import { Router } from 'express';
import { CreateInstrumentTokenSchema, CreateStationSchema, StationListQuerySchema, UpdateStationSchema } from '../../../shared/schemas/stations';
import { IdParamsSchema } from '../../../shared/schemas/users';
import { authorize } from '../../middleware/auth';
import { validate } from '../../middleware/validate';
import { createStation, createToken, getStation, listStations, revokeToken, TokenParamsSchema, updateStation } from './handlers';

/** Stations and the instrument tokens bound to them. */
export function stationsRouter(): Router {
  const router = Router();
  router.get('/', authorize('lab.read'), validate(StationListQuerySchema, 'query'), listStations);
  router.post('/', authorize('stations.write'), validate(CreateStationSchema), createStation);
  router.get('/:id', authorize('lab.read'), validate(IdParamsSchema, 'params'), getStation);
  router.patch('/:id', authorize('stations.write'), validate(IdParamsSchema, 'params'), validate(UpdateStationSchema), updateStation);
  router.post('/:id/tokens', authorize('stations.write'), validate(IdParamsSchema, 'params'), validate(CreateInstrumentTokenSchema), createToken);
  router.post('/:id/tokens/:tokenId/revoke', authorize('stations.write'), validate(TokenParamsSchema, 'params'), revokeToken);
  return router;
}
