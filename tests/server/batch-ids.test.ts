import { describe, expect, it } from 'vitest';
import { z } from 'zod';
import { batchIds, MAX_BATCH_IDS } from '../../server/modules/common/batch-ids';

// The layout is RFC 9562 §5.7 (UUID version 7); zod's version-7 check is the outside reference.
const version7 = z.uuid({ version: 'v7' });

describe('batch ids', () => {
  it('are version 7 UUIDs whose first 48 bits are the batch time in Unix milliseconds', () => {
    const at = new Date('2026-03-14T07:30:00.123Z');
    const id = batchIds(at);
    for (const n of [0, 1, 255, 65_536, MAX_BATCH_IDS - 1]) {
      expect(version7.safeParse(id(n)).success).toBe(true);
      // RFC 9562 §5.7: unix_ts_ms is the first 48 bits, big-endian.
      expect(parseInt(id(n).replace(/-/g, '').slice(0, 12), 16)).toBe(at.getTime());
    }
  });

  it('follow one another within a batch, as text and as PostgreSQL orders uuids (byte by byte)', () => {
    const id = batchIds(new Date());
    const ids = [0, 1, 2, 15, 16, 255, 256, 100_000, 1_000_000].map(id);
    expect([...ids].sort()).toEqual(ids);
    expect(new Set(ids).size).toBe(ids.length);
  });

  it('differ between batches made in the same millisecond', () => {
    const at = new Date();
    const firsts = new Set(Array.from({ length: 50 }, () => batchIds(at)(0)));
    expect(firsts.size).toBe(50);
  });

  it('refuse a row number the counter cannot hold and a time the layout cannot hold', () => {
    const id = batchIds(new Date());
    expect(() => id(MAX_BATCH_IDS)).toThrow(RangeError);
    expect(() => id(-1)).toThrow(RangeError);
    expect(() => id(1.5)).toThrow(RangeError);
    expect(() => batchIds(new Date(-1))).toThrow(RangeError);
    expect(() => batchIds(new Date(Number.NaN))).toThrow(RangeError);
  });
});
