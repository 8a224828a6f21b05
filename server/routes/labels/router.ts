import { Router } from 'express';
import { LabelPrintSchema } from '../../../shared/schemas/labels';
import { authorize } from '../../middleware/auth';
import { validate } from '../../middleware/validate';
import { listLabelStocks, printLabels, refuseTooManyLabels } from './handlers';

/** Labels: the stocks they print on, and printing a PDF of labels (each print a ledger event). */
export function labelsRouter(): Router {
  const router = Router();
  router.get('/stocks', authorize('labels.print'), listLabelStocks);
  router.post('/', authorize('labels.print'), refuseTooManyLabels, validate(LabelPrintSchema), printLabels);
  return router;
}
