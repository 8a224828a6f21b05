/**
 * Attachments: files stored once under their SHA-256 in object storage, their metadata in
 * PostgreSQL, and the `attached` ledger event that ties a hash to an item. Also the re-hash
 * check the verifier runs over stored objects.
 */
import { randomUUID } from 'node:crypto';
import { QueryTypes, type Sequelize } from 'sequelize';
import {
  attachmentTypeOf,
  type AttachmentCategory,
  type AttachmentFields,
  type AttachmentUploadResult,
  type AttachmentView,
  type FileCheck,
} from '../../shared/schemas/attachments';
import type { AppContext } from '../app';
import { AppError } from '../errors';
import type { LedgerActor } from '../ledger/types';
import { objectKeyOf, type ObjectStore } from '../storage/object-store';
import { recordEvent } from './record-event';

/** A file the upload parser has written to a temporary file, hashed on the way. */
export interface ReceivedFile {
  path: string;
  size: number;
  sha256: string;
  mediaType: string;
  fileName: string;
}

interface AttachmentRow {
  sha256: string;
  size_bytes: string | number;
  media_type: string;
  category: AttachmentCategory;
  file_name: string;
  created_at: string;
}

const ROW_COLUMNS = `sha256, size_bytes, media_type, category, file_name,
  to_char(created_at AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.MS"Z"') AS created_at`;

/** The storage the context holds, or a 503 that says what to configure. */
export function requireStorage(ctx: AppContext): ObjectStore {
  if (ctx.storage === null) {
    throw new AppError(
      503,
      'storage_unavailable',
      'No object storage is configured for attachments. Set S3_ENDPOINT or S3_BUCKET (with its keys), or run npm start, which starts a local stand-in.',
    );
  }
  return ctx.storage;
}

/** The path a stored file streams from. */
export function attachmentHref(sha256: string): string {
  return `/api/attachments/${sha256}`;
}

function present(row: AttachmentRow): AttachmentView {
  return {
    sha256: row.sha256,
    size: Number(row.size_bytes),
    type: row.media_type,
    category: row.category,
    fileName: row.file_name,
    display: attachmentTypeOf(row.media_type)?.display ?? 'link',
    createdAt: row.created_at,
    href: attachmentHref(row.sha256),
  };
}

/** Metadata of stored attachments by hash (in the order asked; unknown hashes are left out). */
export async function readAttachments(sequelize: Sequelize, hashes: readonly string[]): Promise<AttachmentView[]> {
  if (hashes.length === 0) return [];
  const rows = await sequelize.query<AttachmentRow>(`SELECT ${ROW_COLUMNS} FROM attachments WHERE sha256 = ANY($1::text[])`, {
    bind: [[...new Set(hashes)]],
    type: QueryTypes.SELECT,
  });
  const byHash = new Map(rows.map((r) => [r.sha256, present(r)]));
  return [...new Set(hashes)].flatMap((h) => byHash.get(h) ?? []);
}

/**
 * Keeps an uploaded file: puts it in object storage under its hash unless an object of that
 * size is already there, records its metadata once (the first upload's name and category stay),
 * and, when `fields.itemCode` is given, records an `attached` event carrying the hash.
 */
export async function storeAttachment(
  ctx: AppContext,
  file: ReceivedFile,
  fields: AttachmentFields & { category: AttachmentCategory },
  actor: LedgerActor,
): Promise<AttachmentUploadResult> {
  const storage = requireStorage(ctx);
  const key = objectKeyOf(file.sha256);
  const storedSize = await storage.sizeOf(key);
  if (storedSize !== file.size) await storage.putFile(key, file.path, file.size, file.mediaType);
  const inserted = await ctx.sequelize.query<AttachmentRow>(
    `INSERT INTO attachments (sha256, size_bytes, media_type, category, file_name, object_key, uploaded_by_user_id, uploaded_by_token_id)
     VALUES ($1, $2, $3, $4, $5, $6, $7, $8)
     ON CONFLICT (sha256) DO NOTHING
     RETURNING ${ROW_COLUMNS}`,
    {
      bind: [
        file.sha256,
        file.size,
        file.mediaType,
        fields.category,
        file.fileName,
        key,
        actor.kind === 'user' ? actor.id : null,
        actor.kind === 'instrument' ? actor.id : null,
      ],
      type: QueryTypes.SELECT,
    },
  );
  const [view] = inserted.length > 0 ? [present(inserted[0]!)] : await readAttachments(ctx.sequelize, [file.sha256]);
  if (!view) throw new Error(`attachment ${file.sha256} was neither inserted nor found`);

  let event: AttachmentUploadResult['event'] = null;
  if (fields.itemCode) {
    const recorded = await recordEvent(
      ctx,
      {
        idempotencyKey: fields.idempotencyKey ?? randomUUID(),
        type: 'attached',
        itemCode: fields.itemCode,
        ...(fields.stationCode ? { stationCode: fields.stationCode } : {}),
        occurredAt: fields.occurredAt ?? new Date().toISOString(),
        payload: {
          sha256: file.sha256,
          size: file.size,
          type: file.mediaType,
          name: file.fileName,
          category: fields.category,
          ...(fields.note ? { note: fields.note } : {}),
        },
      },
      { actor },
    );
    event = { item: recorded.event.item, seq: recorded.event.seq, hash: recorded.event.hash };
  }
  return { ...view, created: inserted.length > 0, event };
}

/**
 * Checks stored objects against their hashes. `rehash` reads every byte and hashes it again
 * (what the verifier and the audit pack do); `presence` only asks the store for each object's
 * size (cheap enough for every trace).
 */
export async function checkFiles(
  ctx: AppContext,
  files: readonly { sha256: string; size: number }[],
  mode: 'rehash' | 'presence',
): Promise<FileCheck[]> {
  if (files.length === 0) return [];
  const storage = requireStorage(ctx);
  const checks: FileCheck[] = [];
  for (const file of files) {
    const key = objectKeyOf(file.sha256);
    const short = file.sha256.slice(0, 12);
    if (mode === 'presence') {
      const size = await storage.sizeOf(key);
      if (size === null) checks.push({ sha256: file.sha256, ok: false, problem: 'missing', actual: null, message: `File ${short}… is missing from storage.` });
      else if (size !== file.size) {
        checks.push({ sha256: file.sha256, ok: false, problem: 'size', actual: null, message: `File ${short}… is ${size} bytes in storage; ${file.size} were recorded.` });
      } else checks.push({ sha256: file.sha256, ok: true, problem: null, actual: null, message: `File ${short}… is present (${size} bytes).` });
      continue;
    }
    const again = await storage.rehash(key);
    if (again === null) {
      checks.push({ sha256: file.sha256, ok: false, problem: 'missing', actual: null, message: `File ${short}… is missing from storage.` });
    } else if (again.sha256 !== file.sha256) {
      checks.push({
        sha256: file.sha256,
        ok: false,
        problem: 'changed',
        actual: again.sha256,
        message: `File ${short}… no longer hashes to its name: its bytes hash to ${again.sha256.slice(0, 12)}….`,
      });
    } else {
      checks.push({ sha256: file.sha256, ok: true, problem: null, actual: again.sha256, message: `File ${short}… re-hashed: matches (${again.size} bytes).` });
    }
  }
  return checks;
}
