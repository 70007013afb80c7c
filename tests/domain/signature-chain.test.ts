import { createHash } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { GENESIS_HASH, canonicalize, chainHash, verifyChain, type ChainRecord } from '../../shared/domain/signature-chain';

// The server's injected hash: SHA-256 over the UTF-8 bytes, lowercase hex.
const sha256Hex = (s: string) => createHash('sha256').update(s, 'utf8').digest('hex');

describe('injected SHA-256', () => {
  it('matches the published SHA-256 test vectors', () => {
    // FIPS 180-2 (and NIST CSRC example), SHA-256 of "abc"
    expect(sha256Hex('abc')).toBe('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad');
    // FIPS 180-2 two-block example (from memory)
    expect(sha256Hex('abcdbcdecdefdefgefghfghighijhijkijkljklmklmnlmnomnopnopq')).toBe('248d6a61d20638b8e5c026930c3e6039a33ce45964ff2167f6ecedd419db06c1');
  });
});

describe('canonicalize: RFC 8785 examples', () => {
  it('serializes the RFC 8785 sample object (numbers, string escapes, literals, sorted)', () => {
    // RFC 8785 §3.2.2 sample input, §3.2.3 sorted canonical output
    const input = JSON.parse(
      '{"numbers": [333333333.33333329, 1E30, 4.50, 2e-3, 0.000000000000000000000000001],' +
        ' "string": "\\u20ac$\\u000F\\u000aA\'\\u0042\\u0022\\u005c\\\\\\"\\/",' +
        ' "literals": [null, true, false]}',
    );
    expect(canonicalize(input)).toBe(
      '{"literals":[null,true,false],"numbers":[333333333.3333333,1e+30,4.5,0.002,1e-27],' + '"string":"€$\\u000f\\nA\'B\\"\\\\\\\\\\"/"}',
    );
  });

  it('sorts keys by UTF-16 code units (emoji before U+FB33)', () => {
    // RFC 8785 §3.2.3 sorting example; expected order of the values:
    // Carriage Return, One, Control, Latin Small Letter O With Diaeresis,
    // Euro Sign, Emoji: Grinning Face, Hebrew Letter Dalet With Dagesh
    const input = JSON.parse(
      '{"\\u20ac": "Euro Sign", "\\r": "Carriage Return", "\\ufb33": "Hebrew Letter Dalet With Dagesh",' +
        ' "1": "One", "\\ud83d\\ude00": "Emoji: Grinning Face", "\\u0080": "Control",' +
        ' "\\u00f6": "Latin Small Letter O With Diaeresis"}',
    );
    const out = canonicalize(input);
    const textualOrder = [...out.matchAll(/:"([^"]+)"/g)].map((m) => m[1]);
    expect(textualOrder).toEqual([
      'Carriage Return',
      'One',
      'Control',
      'Latin Small Letter O With Diaeresis',
      'Euro Sign',
      'Emoji: Grinning Face',
      'Hebrew Letter Dalet With Dagesh',
    ]);
    expect(out).toBe(
      '{"\\r":"Carriage Return","1":"One","\u0080":"Control","ö":"Latin Small Letter O With Diaeresis",' +
        '"€":"Euro Sign","😀":"Emoji: Grinning Face","\ufb33":"Hebrew Letter Dalet With Dagesh"}',
    );
  });

  it('sorts nested objects, keeps array order, writes no whitespace', () => {
    // RFC 8785 §3.2.3: sorting applies recursively; arrays keep their order
    expect(canonicalize({ b: [{ z: 1, a: 2 }, 3], a: { d: true, c: null } })).toBe('{"a":{"c":null,"d":true},"b":[{"a":2,"z":1},3]}');
  });

  it('writes -0 as 0 and keeps non-ASCII text unescaped', () => {
    // RFC 8785 §3.2.2: ECMAScript number serialization (-0 → 0); strings
    // escape only ", \ and control characters
    expect(canonicalize({ n: -0, s: 'Ölkanne ✓' })).toBe('{"n":0,"s":"Ölkanne ✓"}');
  });

  it('writes Dates as ISO 8601 strings', () => {
    expect(canonicalize({ at: new Date(Date.UTC(2026, 2, 4, 15, 20)) })).toBe('{"at":"2026-03-04T15:20:00.000Z"}');
  });
});

describe('canonicalize: rejects what JSON cannot hold', () => {
  it.each([
    ['undefined property', { a: undefined }, /\$\.a is undefined/],
    ['undefined array item', [1, undefined], /\$\[1\] is undefined/],
    ['sparse array hole', [1, , 3], /\$\[1\] is undefined/], // eslint-disable-line no-sparse-arrays
    ['NaN', { n: Number.NaN }, /\$\.n is NaN/],
    ['Infinity', { n: [Number.POSITIVE_INFINITY] }, /\$\.n\[0\] is Infinity/],
    ['function', { f: () => 1 }, /\$\.f is a function/],
    ['bigint', { b: 10n }, /\$\.b is a bigint/],
    ['symbol value', { s: Symbol('x') }, /\$\.s is a symbol/],
    ['symbol key', { [Symbol('k')]: 1 }, /has symbol keys/],
    ['Map', { m: new Map() }, /\$\.m is a Map, not a plain object/],
    ['class instance', { c: new (class Lockout {})() }, /\$\.c is a Lockout instance, not a plain object/],
    ['invalid Date', { d: new Date('nope') }, /\$\.d is an invalid Date/],
    ['lone surrogate in value', { s: 'a\ud800b' }, /\$\.s contains a lone UTF-16 surrogate/],
    ['lone surrogate in key', { ['\udc00']: 1 }, /key .* contains a lone UTF-16 surrogate/],
    ['top-level undefined', undefined, /\$ is undefined/],
  ])('%s', (_name, value, message) => {
    expect(() => canonicalize(value)).toThrow(message);
  });

  it('rejects circular references but allows shared ones', () => {
    const loop: Record<string, unknown> = { a: 1 };
    loop.self = loop;
    expect(() => canonicalize(loop)).toThrow(/\$\.self is a circular reference/);
    const shared = { x: 1 };
    expect(canonicalize({ p: shared, q: shared })).toBe('{"p":{"x":1},"q":{"x":1}}');
  });
});

describe('chainHash', () => {
  it('is SHA-256 of prevHash, a newline and the canonical content', () => {
    expect(GENESIS_HASH).toBe('0'.repeat(64));
    const content = { step: 'lockout', by: 'op-17' };
    expect(chainHash(GENESIS_HASH, content, sha256Hex)).toBe(sha256Hex(`${'0'.repeat(64)}\n{"by":"op-17","step":"lockout"}`));
  });

  it('does not depend on key order but does depend on the previous hash', () => {
    const a = chainHash(GENESIS_HASH, { x: 1, y: [2, 3] }, sha256Hex);
    const b = chainHash(GENESIS_HASH, { y: [2, 3], x: 1 }, sha256Hex);
    expect(a).toBe(b);
    expect(chainHash(a, { x: 1, y: [2, 3] }, sha256Hex)).not.toBe(a);
  });

  it('rejects a malformed prevHash or a hash function with the wrong output', () => {
    expect(() => chainHash('abc', {}, sha256Hex)).toThrow(/prevHash must be 64 lowercase hex characters \(got "abc"\)/);
    expect(() => chainHash(GENESIS_HASH.toUpperCase().replace(/0/g, 'A'), {}, sha256Hex)).toThrow(/prevHash/);
    expect(() => chainHash(GENESIS_HASH, {}, (s) => sha256Hex(s).toUpperCase())).toThrow(/sha256Hex returned .*expected 64 lowercase hex characters/);
    expect(() => chainHash(GENESIS_HASH, {}, (s) => createHash('sha256').update(s).digest('base64'))).toThrow(/expected 64 lowercase hex/);
    expect(() => chainHash(GENESIS_HASH, {}, 'sha256' as unknown as (s: string) => string)).toThrow(/sha256Hex must be a function/);
  });
});

describe('verifyChain', () => {
  function buildChain(contents: unknown[]): ChainRecord[] {
    const records: ChainRecord[] = [];
    let prev = GENESIS_HASH;
    contents.forEach((content, i) => {
      const hash = chainHash(prev, content, sha256Hex);
      records.push({ id: `r${i + 1}`, prevHash: prev, hash, content });
      prev = hash;
    });
    return records;
  }
  const contents = [
    { kind: 'loto-applied', machine: 'punch-2', at: '2026-03-04T07:00:00Z' },
    { kind: 'ppe-check', items: ['face shield', 'gloves'], ok: true },
    { kind: 'hot-work-ended', at: '2026-03-04T11:30:00Z' },
    { kind: 'fire-watch-signed', minutes: 60 },
  ];

  it('accepts an intact chain', () => {
    expect(verifyChain(buildChain(contents), sha256Hex)).toEqual({ ok: true, count: 4 });
  });

  it('accepts an empty chain', () => {
    expect(verifyChain([], sha256Hex)).toEqual({ ok: true, count: 0 });
  });

  it('detects altered content', () => {
    const chain = buildChain(contents);
    chain[1] = { ...chain[1], content: { ...(chain[1].content as object), ok: false } };
    expect(verifyChain(chain, sha256Hex)).toEqual({
      ok: false,
      count: 1,
      firstBadId: 'r2',
      problem: 'content-altered',
    });
  });

  it('detects a deleted middle record as a broken link', () => {
    const chain = buildChain(contents);
    chain.splice(1, 1);
    expect(verifyChain(chain, sha256Hex)).toEqual({
      ok: false,
      count: 1,
      firstBadId: 'r3',
      problem: 'link-broken',
    });
  });

  it('detects reordered records', () => {
    const chain = buildChain(contents);
    [chain[1], chain[2]] = [chain[2], chain[1]];
    expect(verifyChain(chain, sha256Hex)).toEqual({
      ok: false,
      count: 1,
      firstBadId: 'r3',
      problem: 'link-broken',
    });
  });

  it('detects a rewritten record whose own hash was recomputed, at the next record', () => {
    const chain = buildChain(contents);
    const forged = { kind: 'ppe-check', items: [], ok: true };
    chain[1] = { ...chain[1], content: forged, hash: chainHash(chain[1].prevHash, forged, sha256Hex) };
    expect(verifyChain(chain, sha256Hex)).toEqual({
      ok: false,
      count: 2,
      firstBadId: 'r3',
      problem: 'link-broken',
    });
  });

  it('detects a first record that does not start from the genesis hash', () => {
    const chain = buildChain(contents).slice(1);
    expect(verifyChain(chain, sha256Hex)).toEqual({
      ok: false,
      count: 0,
      firstBadId: 'r2',
      problem: 'link-broken',
    });
  });

  it('detects a stored hash that was edited', () => {
    const chain = buildChain(contents);
    chain[3] = { ...chain[3], hash: 'f'.repeat(64) };
    expect(verifyChain(chain, sha256Hex)).toEqual({
      ok: false,
      count: 3,
      firstBadId: 'r4',
      problem: 'content-altered',
    });
  });

  it('throws for input that is not a record list, naming the problem', () => {
    const chain = buildChain(contents);
    expect(() => verifyChain('x' as unknown as ChainRecord[], sha256Hex)).toThrow(/records must be an array/);
    expect(() => verifyChain([{ ...chain[0], hash: null as unknown as string }], sha256Hex)).toThrow(/records\[0\]\.hash must be a string \(got null\)/);
    expect(() => verifyChain([{ ...chain[0], id: '' }], sha256Hex)).toThrow(/records\[0\]\.id must not be empty/);
    expect(() => verifyChain(chain, undefined as unknown as (s: string) => string)).toThrow(/sha256Hex must be a function/);
    expect(() => verifyChain([{ ...chain[0], content: { n: Number.NaN } }], sha256Hex)).toThrow(/records\[0\] \(id r1\): canonicalize: \$\.n is NaN/);
  });
});
