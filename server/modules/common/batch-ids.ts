import { randomBytes } from 'node:crypto';

/** The counter takes the last 32 bits, so one batch may hold this many rows. */
export const MAX_BATCH_IDS = 2 ** 32;

/**
 * Ids for the rows of one bulk write, in the UUID version 7 layout (RFC 9562 §5.7): 48 bits of
 * Unix milliseconds, the version, then 74 bits of which 42 are random and fixed for the batch
 * and the last 32 are a counter (RFC 9562 §6.2, method 1, a fixed-length dedicated counter).
 * A batch's ids follow one another, so the primary key's index grows at one edge instead of
 * touching a random page for every row, and are unique without a call to the random source
 * per row.
 */
export function batchIds(at: Date): (n: number) => string {
  const ms = at.getTime();
  if (!Number.isInteger(ms) || ms < 0 || ms >= 2 ** 48) throw new RangeError(`A version 7 id cannot hold the time ${at.toISOString()}`);
  const time = ms.toString(16).padStart(12, '0');
  const random = randomBytes(6).toString('hex'); // 48 bits drawn, 42 kept
  const variant = (0x8 | (parseInt(random[3], 16) & 0x3)).toString(16);
  const prefix = `${time.slice(0, 8)}-${time.slice(8)}-7${random.slice(0, 3)}-${variant}${random.slice(4, 7)}-${random.slice(7, 11)}`;
  return (n) => {
    if (!Number.isInteger(n) || n < 0 || n >= MAX_BATCH_IDS) throw new RangeError(`Row ${n} is outside one batch of ids`);
    return prefix + n.toString(16).padStart(8, '0');
  };
}
