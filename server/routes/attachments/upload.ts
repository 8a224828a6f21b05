/**
 * The attachment upload parser: multer with a storage engine that streams each file to a
 * temporary file while hashing it (SHA-256), counting its bytes against its type's limit and
 * checking its first bytes against its claimed type. Nothing is held in memory, so a video of
 * hundreds of megabytes passes through in small chunks.
 */
import { createHash, randomUUID } from 'node:crypto';
import { createWriteStream, mkdirSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { Transform } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import type { NextFunction, Request, RequestHandler, Response } from 'express';
import multer, { type StorageEngine } from 'multer';
import {
  ATTACHMENT_MAX_BYTES,
  attachmentTypeOf,
  attachmentTypeOfName,
  describeAcceptedTypes,
  describeBytes,
  type AttachmentType,
} from '../../../shared/schemas/attachments';
import type { ReceivedFile } from '../../commands/attachments';
import { AppError } from '../../errors';

declare module 'express-serve-static-core' {
  interface Request {
    /** The file POST /api/attachments received, hashed and on disk. */
    received?: ReceivedFile;
  }
}

const TEXT_TYPES = new Set(['text/csv', 'text/plain']);

/**
 * Whether a file's first bytes fit its type. Signatures: JPEG starts with the SOI marker FF D8
 * and a marker FF (ITU-T T.81 / JFIF); PNG with its eight-byte signature (PNG specification,
 * ISO/IEC 15948, §5.2); WebP is a RIFF container whose form type is "WEBP"; MP4 (ISO base media
 * file format, ISO/IEC 14496-12) opens with a box whose type is "ftyp"; WebM is Matroska, whose
 * EBML header starts 1A 45 DF A3. Text must hold no NUL byte (checked over the whole file).
 */
export function headFitsType(head: Buffer, mediaType: string): boolean {
  const ascii = (from: number, to: number) => head.subarray(from, to).toString('latin1');
  switch (mediaType) {
    case 'image/jpeg':
      return head.length >= 3 && head[0] === 0xff && head[1] === 0xd8 && head[2] === 0xff;
    case 'image/png':
      return head.subarray(0, 8).equals(Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]));
    case 'image/webp':
      return ascii(0, 4) === 'RIFF' && ascii(8, 12) === 'WEBP';
    case 'video/mp4':
      return ascii(4, 8) === 'ftyp';
    case 'video/webm':
      return head.subarray(0, 4).equals(Buffer.from([0x1a, 0x45, 0xdf, 0xa3]));
    default:
      return TEXT_TYPES.has(mediaType) && !head.includes(0);
  }
}

/**
 * The accepted type of an upload from its name and declared media type: both must agree when
 * both are known; a generic declared type (application/octet-stream) defers to the name.
 */
function typeOfUpload(fileName: string, declared: string): AttachmentType {
  const byName = attachmentTypeOfName(fileName);
  const byMedia = attachmentTypeOf(declared);
  // Browsers label .csv as application/vnd.ms-excel on some systems and .log as nothing at all.
  const generic = byMedia === null;
  if (byName !== null && (generic || byMedia === byName || (TEXT_TYPES.has(byName.mediaType) && byMedia !== null && TEXT_TYPES.has(byMedia.mediaType)))) {
    return byName;
  }
  if (byName === null && byMedia !== null) return byMedia;
  throw new AppError(
    415,
    'unsupported_type',
    byName !== null && byMedia !== null
      ? `"${fileName}" is named as ${byName.mediaType} but was sent as ${byMedia.mediaType}. Rename the file or send it with its own type.`
      : `"${fileName}" (${declared || 'no type'}) is not a file Halfmark keeps. Accepted: ${describeAcceptedTypes()}.`,
  );
}

function hashingDiskStorage(tmpDir: string): StorageEngine {
  return {
    _handleFile(_req, file, cb) {
      let type: AttachmentType;
      try {
        type = typeOfUpload(file.originalname, file.mimetype);
      } catch (error) {
        file.stream.resume();
        cb(error as Error);
        return;
      }
      mkdirSync(tmpDir, { recursive: true, mode: 0o700 });
      const tmpPath = path.join(tmpDir, `${randomUUID()}.part`);
      const hash = createHash('sha256');
      let size = 0;
      let head = Buffer.alloc(0);
      let headChecked = false;
      const checkHead = (): Error | null => {
        headChecked = true;
        return headFitsType(head, type.mediaType)
          ? null
          : new AppError(
              415,
              'content_mismatch',
              `"${file.originalname}" does not look like ${type.mediaType}: its first bytes are not those of such a file. Check that it is the file you meant to attach.`,
            );
      };
      const meter = new Transform({
        transform(chunk: Buffer, _encoding, done) {
          size += chunk.length;
          if (size > type.maxBytes) {
            done(
              new AppError(
                413,
                'file_too_large',
                `"${file.originalname}" is larger than ${describeBytes(type.maxBytes)}, the most a ${type.mediaType} attachment may be.`,
                { maxBytes: type.maxBytes, mediaType: type.mediaType },
              ),
            );
            return;
          }
          if (!headChecked && head.length < 16) head = Buffer.concat([head, chunk]).subarray(0, 16);
          if (!headChecked && head.length >= 16) {
            const mismatch = checkHead();
            if (mismatch) return done(mismatch);
          }
          if (TEXT_TYPES.has(type.mediaType) && chunk.includes(0)) {
            return done(new AppError(415, 'content_mismatch', `"${file.originalname}" holds binary data (a NUL byte), so it is not a ${type.mediaType} text file.`));
          }
          hash.update(chunk);
          done(null, chunk);
        },
        flush(done) {
          if (size === 0) return done(new AppError(422, 'empty_file', `"${file.originalname}" is empty. Choose the file again.`));
          done(headChecked ? null : checkHead());
        },
      });
      pipeline(file.stream, meter, createWriteStream(tmpPath, { flags: 'wx', mode: 0o600 })).then(
        () => cb(null, { path: tmpPath, size, filename: hash.digest('hex'), mimetype: type.mediaType }),
        (error: unknown) => {
          rmSync(tmpPath, { force: true });
          // Let the rest of the request body flow, so the answer reaches the client.
          file.stream.resume();
          cb(error as Error);
        },
      );
    },
    _removeFile(_req, file, cb) {
      rmSync(file.path, { force: true });
      cb(null);
    },
  };
}

/**
 * Takes one file (form field "file") and the text fields of POST /api/attachments, streaming the
 * file to a temporary folder with its SHA-256; leaves it in req.received and removes the
 * temporary file once the response is sent. Errors: 413 too large, 415 wrong type or content,
 * 422 no file or a malformed form.
 */
export function attachmentUpload(tmpDir = path.join(os.tmpdir(), 'halfmark-uploads')): RequestHandler {
  const upload = multer({
    storage: hashingDiskStorage(tmpDir),
    limits: { fileSize: ATTACHMENT_MAX_BYTES, files: 1, fields: 10, fieldSize: 4000, parts: 12 },
    // File names with accents or other scripts arrive as UTF-8 from browsers.
    defParamCharset: 'utf8',
  }).single('file');
  return (req: Request, res: Response, next: NextFunction) => {
    upload(req, res, (err: unknown) => {
      if (req.file) {
        const tmp = req.file.path;
        res.on('close', () => rmSync(tmp, { force: true }));
      }
      if (err instanceof multer.MulterError) {
        if (err.code === 'LIMIT_FILE_SIZE') {
          return next(new AppError(413, 'file_too_large', `The file is larger than ${describeBytes(ATTACHMENT_MAX_BYTES)}, the most any attachment may be.`));
        }
        return next(new AppError(422, 'bad_upload', `The upload was refused (${err.message}). Send one file in the form field "file".`));
      }
      if (err) return next(err);
      const file = req.file;
      if (!file) return next(new AppError(422, 'no_file', 'Choose a file to attach (form field "file").', [{ path: 'file', message: 'No file was sent.' }]));
      req.received = { path: file.path, size: file.size, sha256: file.filename, mediaType: file.mimetype, fileName: file.originalname };
      next();
    });
  };
}
