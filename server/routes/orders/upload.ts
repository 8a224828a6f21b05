import type { NextFunction, Request, RequestHandler, Response } from 'express';
import multer from 'multer';
import { CUT_LIST_MAX_BYTES } from '../../../shared/schemas/cut-list';
import { AppError } from '../../errors';

const SPREADSHEET = /\.(xlsx|xlsm|xls|ods|numbers)$/i;

/**
 * Takes one CSV file from a multipart upload (field "file") into memory, refusing a missing file,
 * a spreadsheet in place of CSV, and anything over the size limit, each with a message to act on.
 */
export function cutListUpload(): RequestHandler {
  const upload = multer({
    storage: multer.memoryStorage(),
    limits: { fileSize: CUT_LIST_MAX_BYTES, files: 1, fields: 10, parts: 12 },
  }).single('file');
  const limitText = `${CUT_LIST_MAX_BYTES / (1024 * 1024)} MB`;
  return (req: Request, res: Response, next: NextFunction) => {
    upload(req, res, (err: unknown) => {
      if (err instanceof multer.MulterError) {
        if (err.code === 'LIMIT_FILE_SIZE') {
          return next(new AppError(413, 'file_too_large', `The file is larger than ${limitText}, the most one cut-list import takes. Split it into smaller files.`));
        }
        return next(new AppError(422, 'bad_upload', `The upload was refused (${err.message}). Send one CSV file in the form field "file".`));
      }
      if (err) return next(err);
      const file = req.file;
      if (!file) return next(new AppError(422, 'no_file', 'Choose a CSV file to upload (form field "file").'));
      if (SPREADSHEET.test(file.originalname) || /spreadsheetml|ms-excel\.sheet|opendocument\.spreadsheet/.test(file.mimetype)) {
        return next(new AppError(415, 'not_csv', `"${file.originalname}" is a spreadsheet, not CSV. Save it as "CSV UTF-8" and upload that file.`));
      }
      next();
    });
  };
}
