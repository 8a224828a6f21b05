import { Router } from 'express';
import { OrderIdParamsSchema, OrderSpecificationSchema, ReportIssueSchema, ReportNumberParamsSchema } from '../../../shared/schemas/reports';
import { authorize } from '../../middleware/auth';
import { validate } from '../../middleware/validate';
import { getOrderResults, getReportPdf, postReport, putOrderSpecification } from './handlers';

/** Test reports: an order's results and verdicts, its specification, issuing and reading its signed reports. */
export function reportsRouter(): Router {
  const router = Router();
  const orderId = validate(OrderIdParamsSchema, 'params');
  router.get('/orders/:orderId', authorize('lab.read'), orderId, getOrderResults);
  router.put('/orders/:orderId/specification', authorize('results.write'), orderId, validate(OrderSpecificationSchema), putOrderSpecification);
  router.post('/', authorize('results.write'), validate(ReportIssueSchema), postReport);
  router.get('/:number/pdf', authorize('lab.read'), validate(ReportNumberParamsSchema, 'params'), getReportPdf);
  return router;
}
