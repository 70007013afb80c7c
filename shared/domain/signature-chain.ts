/**
 * Tamper-evident hash chain for safety sign-offs.
 *
 * Each record stores the previous record's hash and its own hash over
 * (previous hash, canonical content). Changing, deleting or reordering a
 * stored record then breaks the chain at the first affected record.
 *
 * Pure module: the SHA-256 function is injected (node:crypto on the server,
 * WebCrypto-backed on the client), so nothing here touches Node or I/O.
 */

/** SHA-256 of a string's UTF-8 bytes, as 64 lowercase hex digits. */
export type Sha256Hex = (s: string) => string;

/** prevHash of the first record in a chain: 64 zeros, i.e. "no predecessor". */
export const GENESIS_HASH = '0'.repeat(64);

const HEX64 = /^[0-9a-f]{64}$/;
// A UTF-16 surrogate that is not part of a valid pair.
const LONE_SURROGATE = /[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/;

function describe(value: unknown): string {
  if (value === null) return 'null';
  if (typeof value === 'number') return String(value);
  if (typeof value === 'object') {
    const tag = Object.prototype.toString.call(value).slice(8, -1);
    const ctor = (value as { constructor?: { name?: unknown } }).constructor?.name;
    return tag === 'Object' && typeof ctor === 'string' && ctor !== '' && ctor !== 'Object' ? `${ctor} instance` : tag;
  }
  return typeof value;
}

function checkString(s: string, path: string): string {
  if (LONE_SURROGATE.test(s)) {
    throw new Error(`canonicalize: ${path} contains a lone UTF-16 surrogate (not I-JSON, which RFC 8785 requires)`);
  }
  return JSON.stringify(s);
}

function isPlainObject(value: object): value is Record<string, unknown> {
  const proto = Object.getPrototypeOf(value);
  return proto === Object.prototype || proto === null;
}

function serialize(value: unknown, path: string, ancestors: Set<object>): string {
  if (value === null) return 'null';
  switch (typeof value) {
    case 'boolean':
      return value ? 'true' : 'false';
    case 'number':
      if (!Number.isFinite(value)) {
        throw new Error(`canonicalize: ${path} is ${value}; JSON has no NaN or Infinity`);
      }
      // ECMAScript Number-to-String, which RFC 8785 §3.2.2 prescribes (-0 → "0").
      return JSON.stringify(value);
    case 'string':
      return checkString(value, path);
    case 'undefined':
      throw new Error(`canonicalize: ${path} is undefined; use null or leave the key out`);
    case 'function':
    case 'symbol':
    case 'bigint':
      throw new Error(`canonicalize: ${path} is a ${typeof value}, which JSON cannot represent`);
  }
  const obj = value as object;
  if (obj instanceof Date) {
    if (Number.isNaN(obj.getTime())) throw new Error(`canonicalize: ${path} is an invalid Date`);
    return JSON.stringify(obj.toISOString());
  }
  if (ancestors.has(obj)) throw new Error(`canonicalize: ${path} is a circular reference`);
  ancestors.add(obj);
  try {
    if (Array.isArray(obj)) {
      const parts: string[] = [];
      for (let i = 0; i < obj.length; i++) {
        // Holes in sparse arrays read as undefined and are rejected there.
        parts.push(serialize(obj[i], `${path}[${i}]`, ancestors));
      }
      return `[${parts.join(',')}]`;
    }
    if (!isPlainObject(obj)) {
      throw new Error(`canonicalize: ${path} is a ${describe(obj)}, not a plain object; only plain objects, arrays, Dates and JSON primitives are allowed`);
    }
    if (Object.getOwnPropertySymbols(obj).length > 0) {
      throw new Error(`canonicalize: ${path} has symbol keys, which JSON cannot represent`);
    }
    // Default sort compares UTF-16 code units, which is RFC 8785 §3.2.3 order.
    const keys = Object.keys(obj).sort();
    const parts = keys.map((key) => {
      const keyPath = `${path}.${key}`;
      return `${checkString(key, `key ${JSON.stringify(key)} at ${path}`)}:${serialize(obj[key], keyPath, ancestors)}`;
    });
    return `{${parts.join(',')}}`;
  } finally {
    ancestors.delete(obj);
  }
}

/**
 * Deterministic JSON text for hashing.
 *
 * Follows RFC 8785 (JSON Canonicalization Scheme) as far as a JS value allows:
 * object keys sorted by UTF-16 code units at every level (§3.2.3), no
 * whitespace, numbers and strings serialized as ECMAScript JSON.stringify does
 * (§3.2.2), lone surrogates rejected (I-JSON). Additions outside RFC 8785,
 * because the input is a JS value, not JSON text: a Date becomes its ISO 8601
 * string (toISOString); undefined, NaN, ±Infinity, functions, symbols,
 * bigints, non-plain objects (Map, Set, class instances) and circular
 * references are rejected instead of being dropped or coerced. The injected
 * hash must hash the UTF-8 bytes of the result (RFC 8785 §3.2.4).
 */
export function canonicalize(value: unknown): string {
  return serialize(value, '$', new Set());
}

function checkedHash(sha256Hex: Sha256Hex, input: string): string {
  if (typeof sha256Hex !== 'function') {
    throw new Error('sha256Hex must be a function (string) => 64-char lowercase hex digest');
  }
  const digest = sha256Hex(input);
  if (typeof digest !== 'string' || !HEX64.test(digest)) {
    throw new Error(
      `sha256Hex returned ${typeof digest === 'string' ? JSON.stringify(digest.slice(0, 80)) : typeof digest}; ` + 'expected 64 lowercase hex characters',
    );
  }
  return digest;
}

/**
 * Hash of one chain record: sha256Hex(prevHash + "\n" + canonicalize(content)).
 *
 * Source: FIPS 180-4 SHA-256 (injected), RFC 8785 canonical JSON for the
 * content. prevHash is the previous record's hash, or GENESIS_HASH for the
 * first record; it must be 64 lowercase hex digits.
 */
export function chainHash(prevHash: string, content: unknown, sha256Hex: Sha256Hex): string {
  if (typeof prevHash !== 'string' || !HEX64.test(prevHash)) {
    throw new Error(`prevHash must be 64 lowercase hex characters (got ${JSON.stringify(prevHash)})`);
  }
  return checkedHash(sha256Hex, `${prevHash}\n${canonicalize(content)}`);
}

export interface ChainRecord {
  id: string;
  prevHash: string;
  hash: string;
  content: unknown;
}

export type ChainVerification = { ok: true; count: number } | { ok: false; count: number; firstBadId: string; problem: 'content-altered' | 'link-broken' };

/**
 * Walks records in chain order (oldest first) and reports the first bad one.
 *
 * For record i the link is checked first: its prevHash must equal record
 * i−1's stored hash (GENESIS_HASH for i = 0), otherwise 'link-broken'; a
 * deleted or reordered record shows up this way. Then its stored hash must
 * equal chainHash(prevHash, content), otherwise 'content-altered'. `count` is
 * the number of records verified good before the first bad one (all of them
 * when ok). Limits, inherent to a chain without an external anchor: removing
 * the newest records, or rewriting a record together with every hash after it,
 * is not detectable here; compare the head hash with a copy kept elsewhere.
 *
 * Throws (rather than reporting tampering) for input that is not a record
 * list at all: a non-array, a record without a string id/prevHash/hash, or a
 * hash function that does not return 64 lowercase hex digits.
 */
export function verifyChain(records: readonly ChainRecord[], sha256Hex: Sha256Hex): ChainVerification {
  if (!Array.isArray(records)) throw new Error('records must be an array');
  if (typeof sha256Hex !== 'function') {
    throw new Error('sha256Hex must be a function (string) => 64-char lowercase hex digest');
  }
  let expectedPrev = GENESIS_HASH;
  for (let i = 0; i < records.length; i++) {
    const r = records[i];
    if (r === null || typeof r !== 'object') throw new Error(`records[${i}] must be an object`);
    for (const key of ['id', 'prevHash', 'hash'] as const) {
      if (typeof r[key] !== 'string') {
        throw new Error(`records[${i}].${key} must be a string (got ${describe(r[key])})`);
      }
    }
    if (r.id === '') throw new Error(`records[${i}].id must not be empty`);
    if (r.prevHash !== expectedPrev) {
      return { ok: false, count: i, firstBadId: r.id, problem: 'link-broken' };
    }
    let recomputed: string;
    try {
      recomputed = chainHash(r.prevHash, r.content, sha256Hex);
    } catch (err) {
      const message = err instanceof Error ? err.message : String(err);
      throw new Error(`records[${i}] (id ${r.id}): ${message}`);
    }
    if (recomputed !== r.hash) {
      return { ok: false, count: i, firstBadId: r.id, problem: 'content-altered' };
    }
    expectedPrev = r.hash;
  }
  return { ok: true, count: records.length };
}
