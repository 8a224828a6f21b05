/**
 * Attachments: which files an item may carry (fracture photos, raw data, test video,
 * conditioning logs), how large each kind may be, and the form fields that come with an upload.
 */
import { z } from 'zod';
import { HashHex } from '../domain/ledger/event-hash';

/** What a file is for; the ledger's `attached` event carries it beside the hash. */
export const ATTACHMENT_CATEGORIES = ['photo', 'raw_data', 'video', 'conditioning_log'] as const;
export type AttachmentCategory = (typeof ATTACHMENT_CATEGORIES)[number];

export const ATTACHMENT_CATEGORY_LABELS: Record<AttachmentCategory, string> = {
  photo: 'Fracture photo',
  raw_data: 'Raw data',
  video: 'Test video',
  conditioning_log: 'Conditioning log',
};

const MB = 1024 * 1024;

/** How a file shows on the item page: a picture, a player, or a link. */
export type AttachmentDisplay = 'image' | 'video' | 'link';

/** One accepted media type: its file name endings, the largest size, and the categories it may fill. */
export interface AttachmentType {
  mediaType: string;
  extensions: readonly string[];
  maxBytes: number;
  categories: readonly AttachmentCategory[];
  display: AttachmentDisplay;
}

/**
 * The media types an upload may have. Photos stay small; a test video runs to hundreds of
 * megabytes; raw force–extension records and chamber logs are text.
 */
export const ATTACHMENT_TYPES: readonly AttachmentType[] = [
  { mediaType: 'image/jpeg', extensions: ['.jpg', '.jpeg'], maxBytes: 25 * MB, categories: ['photo'], display: 'image' },
  { mediaType: 'image/png', extensions: ['.png'], maxBytes: 25 * MB, categories: ['photo'], display: 'image' },
  { mediaType: 'image/webp', extensions: ['.webp'], maxBytes: 25 * MB, categories: ['photo'], display: 'image' },
  { mediaType: 'text/csv', extensions: ['.csv'], maxBytes: 100 * MB, categories: ['raw_data', 'conditioning_log'], display: 'link' },
  { mediaType: 'text/plain', extensions: ['.txt', '.log'], maxBytes: 100 * MB, categories: ['raw_data', 'conditioning_log'], display: 'link' },
  { mediaType: 'video/mp4', extensions: ['.mp4', '.m4v'], maxBytes: 800 * MB, categories: ['video'], display: 'video' },
  { mediaType: 'video/webm', extensions: ['.webm'], maxBytes: 800 * MB, categories: ['video'], display: 'video' },
];

/** The largest file of any type: the limit the upload parser enforces before the type is known. */
export const ATTACHMENT_MAX_BYTES = Math.max(...ATTACHMENT_TYPES.map((t) => t.maxBytes));

/** A byte count in words, e.g. "25 MB". */
export function describeBytes(bytes: number): string {
  if (bytes >= MB) return `${Math.round((bytes / MB) * 10) / 10} MB`;
  if (bytes >= 1024) return `${Math.round((bytes / 1024) * 10) / 10} kB`;
  return `${bytes} bytes`;
}

/** The accepted type for a file name (by its ending), or null. */
export function attachmentTypeOfName(fileName: string): AttachmentType | null {
  const lower = fileName.toLowerCase();
  return ATTACHMENT_TYPES.find((t) => t.extensions.some((ext) => lower.endsWith(ext))) ?? null;
}

/** The accepted type for a media type, or null. */
export function attachmentTypeOf(mediaType: string): AttachmentType | null {
  const bare = mediaType.split(';')[0]?.trim().toLowerCase() ?? '';
  return ATTACHMENT_TYPES.find((t) => t.mediaType === bare) ?? null;
}

/** The accepted types as one sentence, for error messages and the file picker's hint. */
export function describeAcceptedTypes(): string {
  return ATTACHMENT_TYPES.map((t) => `${t.extensions.join('/')} (up to ${describeBytes(t.maxBytes)})`).join(', ');
}

/** The form fields of POST /api/attachments that come with the file (multipart). */
export const AttachmentFieldsSchema = z.object({
  /** Attach to this item at once: an `attached` event is recorded with the hash. */
  itemCode: z.string().trim().min(1).max(64).optional(),
  /** What the file is for; taken from its type when left out (text counts as raw data). */
  category: z.enum(ATTACHMENT_CATEGORIES, { error: `Category is one of: ${ATTACHMENT_CATEGORIES.join(', ')}.` }).optional(),
  /** A few words for the record, e.g. "fracture face, half A". */
  note: z.string().trim().max(500, 'Keep the note under 500 characters.').optional(),
  stationCode: z.string().trim().min(1).max(64).optional(),
  /** The device's time of the attachment; the server's now when left out. */
  occurredAt: z.string().max(40).optional(),
  /** The client's key, so a retried upload records one event. */
  idempotencyKey: z.string().trim().min(1).max(200).optional(),
});
export type AttachmentFields = z.infer<typeof AttachmentFieldsSchema>;

/** GET /api/attachments/:sha256 path parameter. */
export const AttachmentHashParamsSchema = z.object({ sha256: HashHex });

/** A stored attachment as the API shows it. */
export interface AttachmentView {
  sha256: string;
  size: number;
  type: string;
  category: AttachmentCategory;
  fileName: string;
  display: AttachmentDisplay;
  createdAt: string;
  /** Path the file streams from (GET, with Range support). */
  href: string;
}

/** POST /api/attachments answer: the stored file, whether it was new, and the event that cites it. */
export interface AttachmentUploadResult extends AttachmentView {
  /** False when the same content was already stored: it is kept once. */
  created: boolean;
  event: { item: string; seq: number; hash: string } | null;
}

/** The result of re-hashing one stored object. */
export interface FileCheck {
  sha256: string;
  ok: boolean;
  /** `missing`: no object under the hash; `changed`: its bytes hash to something else; `size`: another length. */
  problem: 'missing' | 'changed' | 'size' | null;
  actual: string | null;
  message: string;
}
