import express, { Router } from 'express';
import { MAX_RECORD_BYTES, RecordUploadQuerySchema, ResultsEntrySchema } from '../../../shared/schemas/results';
import { authorize } from '../../middleware/auth';
import { validate } from '../../middleware/validate';
import { getSpecimenResults, saveSpecimenResults, uploadRecord } from './handlers';

/**
 * Results per specimen: read them with the chart and verdict, upload a raw force–extension
 * record (the CSV as the body, its column mapping in the query), compute and store results.
 */
export function resultsRouter(): Router {
  const router = Router();
  router.get('/specimens/:code', authorize('lab.read'), getSpecimenResults);
  router.post('/specimens/:code', authorize('results.write'), validate(ResultsEntrySchema), saveSpecimenResults);
  router.post(
    '/specimens/:code/records',
    authorize('results.write'),
    // The app parses JSON only; a record arrives as text, too large for the JSON limit.
    express.text({ type: ['text/csv', 'text/plain', 'application/csv', 'text/tab-separated-values'], limit: MAX_RECORD_BYTES }),
    validate(RecordUploadQuerySchema, 'query'),
    uploadRecord,
  );
  return router;
}
