#!/usr/bin/env node
// Halfmark audit pack verifier: checks an audit.jsonl export on its own, with nothing but Node.
//
//   node verify-audit-pack.mjs audit.jsonl          a sentence, then exit 0 (intact) or 1 (broken)
//   node verify-audit-pack.mjs --json audit.jsonl   the full report as JSON
//
// It needs no database, no network and no installed packages: SHA-256 comes from node:crypto
// and the canonical JSON (RFC 8785) is written out below. The rules it checks are those of the
// ledger format, version 1 (docs/ledger-format.md): every event's hash, every chain link, every
// daily seal's hash and link, and that the seals hold the heads of the chains in the pack. It
// stops at the first break and names it: line, item, seq or day, what was expected and found.
import { createHash } from 'node:crypto';
import { readFileSync } from 'node:fs';
import { pathToFileURL } from 'node:url';

// ---- RFC 8785 JSON Canonicalization Scheme ------------------------------------------------

/** Raised for a value RFC 8785 cannot write: NaN, ±Infinity, lone surrogates, non-JSON types. */
export class CanonicalError extends Error {}

function hasLoneSurrogate(text) {
  for (let i = 0; i < text.length; i++) {
    const unit = text.charCodeAt(i);
    if (unit >= 0xd800 && unit <= 0xdbff) {
      const next = text.charCodeAt(i + 1);
      if (!(next >= 0xdc00 && next <= 0xdfff)) return true;
      i++;
    } else if (unit >= 0xdc00 && unit <= 0xdfff) return true;
  }
  return false;
}

function canonicalString(text) {
  if (hasLoneSurrogate(text)) throw new CanonicalError('a string holds a lone UTF-16 surrogate');
  // RFC 8785 §3.2.2.2 writes strings exactly as ECMAScript's JSON.stringify does.
  return JSON.stringify(text);
}

/**
 * The canonical JSON text of a parsed JSON value (RFC 8785): object members sorted by their
 * names as UTF-16 code units, no whitespace, numbers in ECMAScript's shortest round-trip form.
 */
export function canonicalize(value) {
  if (value === null || value === true || value === false) return String(value);
  if (typeof value === 'number') {
    if (!Number.isFinite(value)) throw new CanonicalError(`${value} has no JSON form`);
    // RFC 8785 §3.2.2.3 is ECMAScript's Number.prototype.toString; -0 is written 0.
    return Object.is(value, -0) ? '0' : String(value);
  }
  if (typeof value === 'string') return canonicalString(value);
  if (Array.isArray(value)) return `[${value.map(canonicalize).join(',')}]`;
  if (typeof value === 'object') {
    // Array.prototype.sort with no comparator orders by UTF-16 code units, as §3.2.3 asks.
    const keys = Object.keys(value).sort();
    return `{${keys.map((k) => `${canonicalString(k)}:${canonicalize(value[k])}`).join(',')}}`;
  }
  throw new CanonicalError(`a ${typeof value} is not JSON`);
}

/** SHA-256 of the UTF-8 bytes of a value's canonical JSON, as 64 lowercase hex digits. */
export function hashOf(value) {
  return createHash('sha256').update(canonicalize(value), 'utf8').digest('hex');
}

// ---- Shapes of format version 1 -----------------------------------------------------------

const GENESIS = '0'.repeat(64);
const EVENT_MEMBERS = ['v', 'item', 'seq', 'type', 'actor', 'station', 'container', 'occurredAt', 'recordedAt', 'payload',
  'idempotencyKey', 'corrects', 'signature', 'prevHash'];
const SEAL_MEMBERS = ['v', 'day', 'heads', 'prevSeal'];
const HEADER_MEMBERS = ['record', 'format', 'v', 'exportedAt', 'items', 'firstPrevSeal'];

const isObject = (v) => typeof v === 'object' && v !== null && !Array.isArray(v);
const isHash = (v) => typeof v === 'string' && /^[0-9a-f]{64}$/.test(v);
const isCode = (v) => typeof v === 'string' && /^[\x21-\x7e]{1,64}$/.test(v);
const isCount = (v) => Number.isSafeInteger(v) && v > 0;
const isInstant = (v) => typeof v === 'string' && /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}\.\d{3}Z$/.test(v)
  && Number.isFinite(Date.parse(v)) && new Date(Date.parse(v)).toISOString() === v;
const isDay = (v) => typeof v === 'string' && /^\d{4}-\d{2}-\d{2}$/.test(v) && isInstant(`${v}T00:00:00.000Z`);
const sameMembers = (obj, names) => Object.keys(obj).length === names.length && names.every((n) => Object.hasOwn(obj, n));

function hasProtoKey(value) {
  if (Array.isArray(value)) return value.some(hasProtoKey);
  if (!isObject(value)) return false;
  return Object.keys(value).some((k) => k === '__proto__' || hasProtoKey(value[k]));
}

/** What is wrong with an event body, or null when it fits format v1. */
function eventProblem(b) {
  const extra = Object.keys(b).filter((k) => !EVENT_MEMBERS.includes(k));
  if (extra.length) return `body has members the hash does not cover: ${extra.join(', ')}`;
  const missing = EVENT_MEMBERS.filter((k) => !Object.hasOwn(b, k));
  if (missing.length) return `body lacks ${missing.join(', ')}`;
  if (b.v !== 1) return `v is ${JSON.stringify(b.v)}, not 1 (a format this verifier does not know)`;
  if (!isCode(b.item)) return 'item is not a code';
  if (!isCount(b.seq)) return 'seq is not a positive whole number';
  if (typeof b.type !== 'string' || !/^[a-z][a-z0-9_]{0,39}$/.test(b.type)) return 'type is not lower snake case';
  if (!isObject(b.actor) || !sameMembers(b.actor, ['kind', 'id']) || !['user', 'instrument'].includes(b.actor.kind) || !isCount(b.actor.id)) return 'actor is malformed';
  if (b.station !== null && !isCode(b.station)) return 'station is not a code or null';
  if (b.container !== null && !isCode(b.container)) return 'container is not a code or null';
  if (!isInstant(b.occurredAt) || !isInstant(b.recordedAt)) return 'occurredAt or recordedAt is not an instant like 2026-12-01T10:00:00.000Z';
  if (!isObject(b.payload)) return 'payload is not an object';
  if (hasProtoKey(b.payload)) return 'payload holds a member named __proto__';
  if (typeof b.idempotencyKey !== 'string' || b.idempotencyKey.length < 1 || b.idempotencyKey.length > 200) return 'idempotencyKey is malformed';
  if (b.corrects !== null && !isHash(b.corrects)) return 'corrects is not a hash or null';
  if (b.signature !== null && (!isObject(b.signature) || !sameMembers(b.signature, ['signer', 'meaning', 'signedAt'])
    || !isCount(b.signature.signer) || typeof b.signature.meaning !== 'string' || !isInstant(b.signature.signedAt))) return 'signature is malformed';
  if (!isHash(b.prevHash)) return 'prevHash is not a hash';
  return null;
}

function sealProblem(b) {
  const extra = Object.keys(b).filter((k) => !SEAL_MEMBERS.includes(k));
  if (extra.length) return `seal body has members the hash does not cover: ${extra.join(', ')}`;
  if (!sameMembers(b, SEAL_MEMBERS)) return `seal body lacks ${SEAL_MEMBERS.filter((k) => !Object.hasOwn(b, k)).join(', ')}`;
  if (b.v !== 1) return `v is ${JSON.stringify(b.v)}, not 1`;
  if (!isDay(b.day)) return 'day is not a calendar day like 2026-12-01';
  if (!isHash(b.prevSeal)) return 'prevSeal is not a hash';
  if (!Array.isArray(b.heads) || !b.heads.every((h) => isObject(h) && sameMembers(h, ['item', 'seq', 'hash']) && isCode(h.item) && isCount(h.seq) && isHash(h.hash))) {
    return 'heads is not a list of {item, seq, hash}';
  }
  return null;
}

const nextDay = (day) => new Date(Date.parse(`${day}T00:00:00.000Z`) + 86_400_000).toISOString().slice(0, 10);

// ---- The check -----------------------------------------------------------------------------

/**
 * Verifies an audit export (the text of audit.jsonl). Answers
 * { ok: true, eventsChecked, sealsChecked, lastSeal } or
 * { ok: false, eventsChecked, sealsChecked, firstBreak: { line, record, reason, message, item, seq, day, expected, actual, items } }.
 */
export function verifyPack(text) {
  const lines = text.split('\n');
  if (lines.at(-1) === '') lines.pop();
  let eventsChecked = 0;
  let sealsChecked = 0;
  const fail = (line, record, reason, message, extra = {}) => ({
    ok: false,
    eventsChecked,
    sealsChecked,
    firstBreak: { line, record, reason, message: `Line ${line}: ${message}`, item: null, seq: null, day: null, expected: null, actual: null, items: [], ...extra },
  });
  if (lines.length === 0) return fail(1, 'header', 'unreadable-line', 'the export is empty');

  const parsed = [];
  for (let i = 0; i < lines.length; i++) {
    try {
      parsed.push(JSON.parse(lines[i]));
    } catch {
      return fail(i + 1, i === 0 ? 'header' : 'event', 'unreadable-line', 'not JSON');
    }
  }
  const header = parsed[0];
  if (!isObject(header) || !sameMembers(header, HEADER_MEMBERS) || header.record !== 'header' || header.format !== 'halfmark-ledger-audit'
    || header.v !== 1 || !isInstant(header.exportedAt) || !isHash(header.firstPrevSeal)
    || !(header.items === null || (Array.isArray(header.items) && header.items.every(isCode)))) {
    return fail(1, 'header', 'unreadable-line', 'not a halfmark-ledger-audit v1 header');
  }
  const scope = header.items === null ? null : new Set(header.items);

  // Chains, in the order the lines give them.
  const chains = new Map();
  const events = [];
  let lineNo = 1;
  for (; lineNo < parsed.length; lineNo++) {
    const rec = parsed[lineNo];
    const line = lineNo + 1;
    if (!isObject(rec) || rec.record !== 'event') break;
    if (!sameMembers(rec, ['record', 'body', 'hash']) || !isObject(rec.body)) return fail(line, 'event', 'unreadable-line', 'not an event line');
    const b = rec.body;
    const at = { item: typeof b.item === 'string' ? b.item : null, seq: typeof b.seq === 'number' ? b.seq : null };
    const problem = eventProblem(b) ?? (isHash(rec.hash) ? null : 'hash is not 64 lowercase hexadecimal digits');
    if (problem) return fail(line, 'event', 'invalid-event', `${at.item ?? 'event'} is not a valid v1 event: ${problem}`, at);
    if (scope && !scope.has(b.item)) return fail(line, 'event', 'out-of-scope', `${b.item} is not among the header's items`, at);
    const chain = chains.get(b.item) ?? { seq: 0, hash: GENESIS, hashes: new Set() };
    const expectedSeq = chain.seq + 1;
    if (b.seq > expectedSeq) return fail(line, 'event', 'seq-gap', `${b.item}: expected seq ${expectedSeq}, found ${b.seq} (an event is missing)`, { ...at, expected: expectedSeq, actual: b.seq });
    if (b.seq < expectedSeq) return fail(line, 'event', 'seq-repeat', `${b.item}: seq ${b.seq} comes again after ${chain.seq}`, { ...at, expected: expectedSeq, actual: b.seq });
    if (b.prevHash !== chain.hash) {
      return fail(line, 'event', 'prev-hash-mismatch', `${b.item} seq ${b.seq}: prevHash does not match the hash of seq ${chain.seq}`, { ...at, expected: chain.hash, actual: b.prevHash });
    }
    let recomputed;
    try {
      recomputed = hashOf(b);
    } catch (error) {
      return fail(line, 'event', 'invalid-event', `${b.item} seq ${b.seq} has no canonical form: ${error.message}`, at);
    }
    if (recomputed !== rec.hash) {
      return fail(line, 'event', 'hash-mismatch', `${b.item} seq ${b.seq}: the stored hash is not the hash of the event's contents (something in it was changed)`, { ...at, expected: recomputed, actual: rec.hash });
    }
    if (b.corrects !== null && !chain.hashes.has(b.corrects)) {
      return fail(line, 'event', 'void-target-unknown', `${b.item} seq ${b.seq}: corrects names no earlier event of this item`, { ...at, actual: b.corrects });
    }
    chain.seq = b.seq;
    chain.hash = recomputed;
    chain.hashes.add(recomputed);
    chains.set(b.item, chain);
    events.push({ item: b.item, seq: b.seq, hash: recomputed, recordedAt: b.recordedAt });
    eventsChecked++;
  }

  // Seals, oldest first, each against the heads recomputed from the events.
  events.sort((a, b) => (a.recordedAt < b.recordedAt ? -1 : a.recordedAt > b.recordedAt ? 1 : 0));
  const latest = new Map();
  let cursor = 0;
  let prevHash = header.firstPrevSeal;
  let prevDay = null;
  let lastSeal = null;
  for (; lineNo < parsed.length; lineNo++) {
    const rec = parsed[lineNo];
    const line = lineNo + 1;
    if (isObject(rec) && rec.record === 'event') return fail(line, 'event', 'line-out-of-place', 'event lines must come before seal lines');
    if (!isObject(rec) || rec.record !== 'seal' || !sameMembers(rec, ['record', 'body', 'hash']) || !isObject(rec.body)) {
      return fail(line, 'event', 'unreadable-line', 'neither an event nor a seal line');
    }
    const b = rec.body;
    const day = typeof b.day === 'string' ? b.day : null;
    const problem = sealProblem(b) ?? (isHash(rec.hash) ? null : 'hash is not 64 lowercase hexadecimal digits');
    if (problem) return fail(line, 'seal', 'invalid-seal', `seal ${day ?? ''} is not a valid v1 seal: ${problem}`, { day });
    if (prevDay !== null && day <= prevDay) return fail(line, 'seal', 'day-out-of-order', `the seal for ${day} comes after the seal for ${prevDay}`, { day, expected: nextDay(prevDay), actual: day });
    if (prevDay !== null && day !== nextDay(prevDay)) return fail(line, 'seal', 'day-gap', `no seal for ${nextDay(prevDay)}: the next seal is for ${day}`, { day, expected: nextDay(prevDay), actual: day });
    const recomputed = hashOf({ v: b.v, day: b.day, heads: b.heads, prevSeal: b.prevSeal });
    if (recomputed !== rec.hash) return fail(line, 'seal', 'seal-hash-mismatch', `seal for ${day}: the stored hash is not the hash of its contents`, { day, expected: recomputed, actual: rec.hash });
    if (b.prevSeal !== prevHash) return fail(line, 'seal', 'prev-seal-mismatch', `seal for ${day}: prevSeal is not the previous seal's hash`, { day, expected: prevHash, actual: b.prevSeal });
    const end = `${nextDay(day)}T00:00:00.000Z`;
    while (cursor < events.length && events[cursor].recordedAt < end) {
      const e = events[cursor++];
      const cur = latest.get(e.item);
      if (!cur || e.seq > cur.seq) latest.set(e.item, e);
    }
    const inScope = (item) => scope === null || scope.has(item);
    const sealed = new Map(b.heads.filter((h) => inScope(h.item)).map((h) => [h.item, h]));
    const differences = [];
    for (const item of [...new Set([...sealed.keys(), ...latest.keys()])].filter(inScope).sort()) {
      const s = sealed.get(item);
      const r = latest.get(item);
      const pick = (h) => (h ? { seq: h.seq, hash: h.hash } : null);
      if (s && !r) differences.push({ item, change: 'missing', sealed: pick(s), recomputed: null });
      else if (!s && r) differences.push({ item, change: 'unsealed', sealed: null, recomputed: pick(r) });
      else if (s.seq !== r.seq || s.hash !== r.hash) differences.push({ item, change: 'changed', sealed: pick(s), recomputed: pick(r) });
    }
    if (differences.length) {
      const named = differences.map((d) => `${d.item} ${d.change}`).join(', ');
      return fail(line, 'seal', 'heads-differ', `seal for ${day} does not match the events: ${named}`, { day, items: differences, item: differences[0].item });
    }
    if (scope === null) {
      const ordered = b.heads.every((h, i) => i === 0 || b.heads[i - 1].item < h.item);
      if (!ordered || b.heads.length !== latest.size) return fail(line, 'seal', 'heads-differ', `seal for ${day}: heads are not listed once each in code order`, { day });
    }
    prevHash = rec.hash;
    prevDay = day;
    lastSeal = { day, hash: rec.hash };
    sealsChecked++;
  }
  return { ok: true, eventsChecked, sealsChecked, lastSeal };
}

/** One sentence for a person. */
export function describeReport(report) {
  if (report.ok) {
    const seal = report.lastSeal ? ` Last seal: ${report.lastSeal.day} ${report.lastSeal.hash} (compare it with the lab's published seal).` : ' No seals in the pack.';
    return `INTACT: ${report.eventsChecked} events and ${report.sealsChecked} seals verify.${seal}`;
  }
  const b = report.firstBreak;
  const where = [b.item, b.seq !== null ? `seq ${b.seq}` : null, b.day].filter(Boolean).join(' ');
  const detail = b.expected !== null || b.actual !== null ? ` Expected ${b.expected ?? '—'}, found ${b.actual ?? '—'}.` : '';
  return `BROKEN at line ${b.line}${where ? ` (${where})` : ''}: ${b.reason}. ${b.message.replace(/^Line \d+: /, '')}.${detail} ${report.eventsChecked} events verified before it.`;
}

function main(argv) {
  const json = argv.includes('--json');
  const files = argv.filter((a) => !a.startsWith('--'));
  if (files.length !== 1) {
    process.stderr.write('Usage: node verify-audit-pack.mjs [--json] <audit.jsonl>\n');
    return 2;
  }
  let text;
  try {
    text = readFileSync(files[0], 'utf8');
  } catch (error) {
    process.stderr.write(`Cannot read ${files[0]}: ${error.message}\n`);
    return 2;
  }
  const report = verifyPack(text);
  process.stdout.write(json ? `${JSON.stringify(report, null, 2)}\n` : `${describeReport(report)}\n`);
  return report.ok ? 0 : 1;
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) process.exitCode = main(process.argv.slice(2));
