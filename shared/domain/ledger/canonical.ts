import canonicalize from 'canonicalize';

/** A value that has exactly one canonical JSON form. */
export type JsonValue = null | boolean | number | string | JsonValue[] | { [key: string]: JsonValue };

/** Raised when a value has no canonical JSON form; `path` points at the offending member. */
export class CanonicalJsonError extends Error {
  readonly path: string;

  constructor(path: string, problem: string) {
    super(`Cannot canonicalise ${path}: ${problem}`);
    this.name = 'CanonicalJsonError';
    this.path = path;
  }
}

function describe(value: unknown): string {
  if (value === undefined) return 'undefined is not JSON';
  if (typeof value === 'function') return 'a function is not JSON';
  if (typeof value === 'symbol') return 'a symbol is not JSON';
  if (typeof value === 'bigint') return 'a bigint is not JSON (use a number or a string)';
  if (typeof value === 'number') return `${String(value)} is not a finite number`;
  return 'not JSON';
}

function memberPath(path: string, key: string): string {
  return /^[A-Za-z_$][A-Za-z0-9_$]*$/.test(key) ? `${path}.${key}` : `${path}[${JSON.stringify(key)}]`;
}

function hasLoneSurrogate(text: string): boolean {
  for (let i = 0; i < text.length; i++) {
    const unit = text.charCodeAt(i);
    if (unit >= 0xd800 && unit <= 0xdbff) {
      const next = text.charCodeAt(i + 1);
      if (!(next >= 0xdc00 && next <= 0xdfff)) return true;
      i++;
    } else if (unit >= 0xdc00 && unit <= 0xdfff) {
      return true;
    }
  }
  return false;
}

/**
 * Walks the value and throws a CanonicalJsonError for anything that the
 * `canonicalize` package would silently drop, turn into null or call toJSON on.
 */
function assertJson(value: unknown, path: string, open: Set<object>): asserts value is JsonValue {
  if (value === null || typeof value === 'boolean') return;
  if (typeof value === 'string') {
    if (hasLoneSurrogate(value)) throw new CanonicalJsonError(path, 'a string holds a lone UTF-16 surrogate');
    return;
  }
  if (typeof value === 'number') {
    if (!Number.isFinite(value)) throw new CanonicalJsonError(path, describe(value));
    return;
  }
  if (typeof value !== 'object') throw new CanonicalJsonError(path, describe(value));
  if (open.has(value)) throw new CanonicalJsonError(path, 'the value refers to itself');
  open.add(value);
  if (Array.isArray(value)) {
    for (let i = 0; i < value.length; i++) {
      // A hole in a sparse array would otherwise become null.
      if (!(i in value)) throw new CanonicalJsonError(`${path}[${i}]`, 'a sparse array hole is not JSON');
      assertJson(value[i], `${path}[${i}]`, open);
    }
  } else {
    const proto: unknown = Object.getPrototypeOf(value);
    // Dates, Maps, class instances: their JSON form depends on toJSON or is lossy; callers pass strings instead.
    if (proto !== Object.prototype && proto !== null) {
      const name = (value as { constructor?: { name?: string } }).constructor?.name ?? 'object';
      throw new CanonicalJsonError(path, `a ${name} is not a plain object`);
    }
    if (Object.getOwnPropertySymbols(value).length > 0) {
      throw new CanonicalJsonError(path, 'symbol keys are not JSON');
    }
    for (const [key, member] of Object.entries(value)) {
      if (hasLoneSurrogate(key)) throw new CanonicalJsonError(path, 'a key holds a lone UTF-16 surrogate');
      assertJson(member, memberPath(path, key), open);
    }
  }
  open.delete(value);
}

/**
 * Serialises a JSON value in the JSON Canonicalization Scheme (RFC 8785): members sorted by
 * UTF-16 code units, no whitespace, ECMAScript number and string forms.
 * Throws CanonicalJsonError for undefined, NaN, ±Infinity, functions, symbols, bigints,
 * sparse arrays, non-plain objects, cycles and lone surrogates, instead of dropping them.
 */
export function canonicalJson(value: unknown): string {
  assertJson(value, '$', new Set());
  const text = canonicalize(value);
  if (text === undefined) throw new CanonicalJsonError('$', 'not JSON');
  return text;
}

/** The UTF-8 bytes of the canonical JSON of a value: the exact input to a ledger hash. */
export function canonicalBytes(value: unknown): Uint8Array {
  return new TextEncoder().encode(canonicalJson(value));
}
