import { createHash } from 'node:crypto';
import { useNativeSha256 } from '../../shared/domain/ledger/sha256';

/** Registers node:crypto's SHA-256 for the ledger's hashing on the server (same digests, native speed). */
export function registerNativeHash(): void {
  useNativeSha256((message) => createHash('sha256').update(message).digest('hex'));
}
