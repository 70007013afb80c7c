import type { PoolClient } from 'pg';
import { from as copyFrom } from 'pg-copy-streams';
import { Readable } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import type { EntityManager, Knex } from '@mikro-orm/postgresql';

/**
 * The set-level half of the counter import, in SQL on a temporary table inside the caller's
 * transaction: the rows that passed the per-row checks arrive by COPY, then duplicates and
 * the order of counts per meter are checked where the readings live, and the good rows move
 * into meter_reading in one statement. Only summaries and the first problems come back.
 */

const STAGING = 'counter_import_staging';
const MARKS = 'counter_import_marks';

/** The transaction's own connection (COPY needs the driver's client, not a query builder). */
export async function transactionClient(tx: EntityManager): Promise<PoolClient> {
  const trx = tx.getTransactionContext<Knex.Transaction>();
  if (!trx) throw new Error('The counter import needs a transaction');
  return await (trx as unknown as { client: { acquireConnection(): Promise<PoolClient> } }).client.acquireConnection();
}

export async function createStaging(client: PoolClient) {
  // The checks sort and hash the whole file once; enough memory keeps that off disk (this transaction only).
  await client.query(`set local work_mem = '64MB'`);
  await client.query(`create temporary table ${STAGING} (
      line integer not null, id uuid not null, meter_id uuid not null, read_at timestamptz not null, value double precision not null,
      is_reset boolean not null, import_key text not null
    ) on commit drop`);
  // Only the rows that will not be added: duplicates and problems (usually none).
  await client.query(`create temporary table ${MARKS} (
      line integer not null, status text not null, problem text, other_at timestamptz, other_value double precision, other_is_reset boolean
    ) on commit drop`);
}

/** The first and last id of one import's batch (`batchIds`): its rows, wherever they are. */
export type BatchRange = { first: string; last: string };

/**
 * For an import that went straight into meter_reading: the rows the checks read are the
 * batch's own readings, seen under the staging table's name (the line is the id's counter).
 * Dropped by `dropBatchView` before the transaction ends.
 */
export async function createBatchView(client: PoolClient, batch: BatchRange) {
  await client.query(`set local work_mem = '64MB'`);
  await client.query(`create or replace temporary view ${STAGING} as
      select ('x' || right(id::text, 8))::bit(32)::integer as line, id, meter_id, read_at, value, is_reset
        from meter_reading where id between '${uuidLiteral(batch.first)}' and '${uuidLiteral(batch.last)}'`);
  await client.query(`create temporary table ${MARKS} (
      line integer not null, status text not null, problem text, other_at timestamptz, other_value double precision, other_is_reset boolean
    ) on commit drop`);
}

export async function dropBatchView(client: PoolClient) {
  await client.query(`drop view if exists ${STAGING}`);
}

/** A view's text cannot take parameters; the ids are ours, but are checked before they are spliced in. */
function uuidLiteral(id: string): string {
  if (!/^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/.test(id)) throw new Error(`Not a uuid: ${id}`);
  return id;
}

/** One meter_reading row in COPY's text format, as `insertFromStaging` would write it; `key` is hex. */
export const readingLine = (
  id: string,
  at: string,
  orgId: string,
  meterId: string,
  readAtIso: string,
  value: number,
  reset: boolean,
  userId: string,
  key: string,
) => `${id}\t${at}\t${at}\t${orgId}\t${meterId}\t${value}\t${readAtIso}\timport\t${reset ? 't' : 'f'}\t\\N\t${userId}\t\\\\x${key}\n`;

/** Streams COPY text from `lines` straight into meter_reading. */
export async function copyIntoReadings(client: PoolClient, lines: AsyncIterable<string>) {
  const copy = client.query(
    copyFrom(
      'copy meter_reading (id, created_at, updated_at, organization_id, meter_id, value, read_at, source, is_reset, note, recorded_by_id, import_key) from stdin',
    ),
  );
  await pipeline(Readable.from(lines, { objectMode: false }), copy);
}

/** Takes back the batch's readings the checks marked as duplicates (equal to one typed in); returns how many. */
export async function removeMarkedDuplicates(client: PoolClient, batch: BatchRange): Promise<number> {
  const res = await client.query(
    `delete from meter_reading r using ${MARKS} m
      where r.id between $1 and $2 and m.status = 'duplicate' and m.line = ('x' || right(r.id::text, 8))::bit(32)::integer`,
    [batch.first, batch.last],
  );
  return res.rowCount ?? 0;
}

/** One staging row in COPY's text format (no field can hold a tab, newline or backslash); `key` is hex. */
export const stagingLine = (line: number, id: string, meterId: string, readAtIso: string, value: number, reset: boolean, key: string) =>
  `${line}\t${id}\t${meterId}\t${readAtIso}\t${value}\t${reset ? 't' : 'f'}\t${key}\n`;

/** Streams COPY text from `lines` into the staging table, with the stream's back-pressure. */
export async function copyIntoStaging(client: PoolClient, lines: AsyncIterable<string>) {
  const copy = client.query(copyFrom(`copy ${STAGING} (line, id, meter_id, read_at, value, is_reset, import_key) from stdin`));
  await pipeline(Readable.from(lines, { objectMode: false }), copy);
  await client.query(`analyze ${STAGING}`);
}

/**
 * All set-level checks in one statement, which records only the rows that will not be added.
 *
 * Duplicates: the same reading (meter, time, value and reset: what the import key hashes)
 * earlier in the file or already stored. Compared on those columns rather than the key, so a
 * reading typed in by hand counts too; stored readings are read only inside each meter's
 * time span in the file.
 *
 * Order: per meter, the rows to add merged with the stored readings in the file's time span
 * and the stored one just before and just after it, ordered by time (stored first, then file
 * order); a row whose counter runs backwards against the point before it is marked 'before'
 * (lower than it, or negative), or, failing that, 'after' against a stored reading right after
 * it. Condition meters may move both ways. The neighbour's time and value are kept for the message.
 * Readings of the import's own batch (when the rows went straight into meter_reading) are never
 * counted as stored.
 */
export async function checkStaging(client: PoolClient, batch: BatchRange) {
  await client.query(
    `
    insert into ${MARKS} (line, status, problem, other_at, other_value, other_is_reset)
    with spans as (
      select meter_id, min(read_at) as first_at, max(read_at) as last_at from ${STAGING} group by meter_id
    ), in_span as materialized (
      -- Per meter through the (meter, time) index, whatever the size of the table: offset 0 keeps the
      -- planner from turning the lateral into a join, or the batch test into a scan of the key.
      select p.meter_id, r.read_at, r.value, r.is_reset from spans p cross join lateral
        (select r.id, r.read_at, r.value, r.is_reset from meter_reading r
          where r.meter_id = p.meter_id and r.read_at between p.first_at and p.last_at offset 0) r
       where r.id not between $1 and $2
    ), stored as (
      select meter_id, read_at, value, is_reset from in_span
      union all
      select p.meter_id, b.read_at, b.value, b.is_reset from spans p cross join lateral
        (select r.read_at, r.value, r.is_reset from meter_reading r where r.meter_id = p.meter_id and r.read_at < p.first_at order by r.read_at desc limit 1) b
      union all
      select p.meter_id, a.read_at, a.value, a.is_reset from spans p cross join lateral
        (select r.read_at, r.value, r.is_reset from meter_reading r where r.meter_id = p.meter_id and r.read_at > p.last_at order by r.read_at asc limit 1) a
    ), file_rows as materialized (
      select f.line, f.meter_id, f.read_at, f.value, f.is_reset, f.repeated or d.meter_id is not null as duplicate
        from (select s.line, s.meter_id, s.read_at, s.value, s.is_reset,
                     row_number() over (partition by s.meter_id, s.read_at, s.value, s.is_reset order by s.line) > 1 as repeated
                from ${STAGING} s) f
        left join (select distinct meter_id, read_at, value, is_reset from in_span) d
          on d.meter_id = f.meter_id and d.read_at = f.read_at and d.value = f.value and d.is_reset = f.is_reset
    ), points as (
      select meter_id, read_at, value, is_reset, null::integer as line from stored
      union all
      select meter_id, read_at, value, is_reset, line from file_rows where not duplicate
    ), neighbours as (
      select p.line, p.value, p.is_reset, m.kind <> 'condition' as cumulative,
             lag(p.read_at) over w as prev_at, lag(p.value) over w as prev_value, lag(p.is_reset) over w as prev_is_reset,
             lead(p.read_at) over w as next_at, lead(p.value) over w as next_value, lead(p.is_reset) over w as next_is_reset,
             lead(p.line) over w as next_line
        from points p join meter m on m.id = p.meter_id
      window w as (partition by p.meter_id order by p.read_at, p.line nulls first)
    ), judged as (
      select n.*, n.cumulative and (n.value < 0 or (n.prev_at is not null and not n.is_reset and n.value < n.prev_value)) as before_bad
        from neighbours n where n.line is not null
    )
    select line, 'duplicate', null, null, null, null from file_rows where duplicate
    union all
    select line, 'error', 'before', prev_at, prev_value, prev_is_reset from judged where before_bad
    union all
    select line, 'error', 'after', next_at, next_value, next_is_reset
      from judged
     where not before_bad and cumulative and next_at is not null and next_line is null
       and (next_value < 0 or (not next_is_reset and next_value < value))`,
    [batch.first, batch.last],
  );
}

export type StagingSummary = {
  counts: { duplicates: number; orderProblems: number };
  /** Status of the given lines that will not be added; lines not named will be. */
  marked: Map<number, 'duplicate' | 'error'>;
  problems: {
    line: number;
    meterId: string;
    readAt: Date;
    value: number;
    reset: boolean;
    problem: 'before' | 'after';
    otherAt: Date | null;
    otherValue: number | null;
    otherIsReset: boolean | null;
  }[];
};

/** What the checks found: counts, the status of the sample lines, and the first order problems. */
export async function summariseStaging(client: PoolClient, maxProblems: number, sampleLines: number[]): Promise<StagingSummary> {
  const counts = await client.query<{ duplicates: string; problems: string }>(
    `select count(*) filter (where status = 'duplicate') as duplicates, count(*) filter (where status = 'error') as problems from ${MARKS}`,
  );
  const c = counts.rows[0];
  const marked = new Map<number, 'duplicate' | 'error'>();
  const problems: StagingSummary['problems'] = [];
  if (Number(c.duplicates) + Number(c.problems) === 0) return { counts: { duplicates: 0, orderProblems: 0 }, marked, problems };
  const sample = await client.query<{ line: number; status: 'duplicate' | 'error' }>(`select line, status from ${MARKS} where line = any($1::int[])`, [
    sampleLines,
  ]);
  for (const r of sample.rows) marked.set(r.line, r.status);
  const found = await client.query<{
    line: number;
    meter_id: string;
    read_at: Date;
    value: number;
    is_reset: boolean;
    problem: 'before' | 'after';
    other_at: Date | null;
    other_value: number | null;
    other_is_reset: boolean | null;
  }>(
    `select m.line, s.meter_id, s.read_at, s.value, s.is_reset, m.problem, m.other_at, m.other_value, m.other_is_reset
       from (select * from ${MARKS} where status = 'error' order by line limit $1) m join ${STAGING} s on s.line = m.line order by m.line`,
    [maxProblems],
  );
  for (const r of found.rows)
    problems.push({
      line: r.line,
      meterId: r.meter_id,
      readAt: new Date(r.read_at),
      value: Number(r.value),
      reset: r.is_reset,
      problem: r.problem,
      otherAt: r.other_at === null ? null : new Date(r.other_at),
      otherValue: r.other_value === null ? null : Number(r.other_value),
      otherIsReset: r.other_is_reset,
    });
  return { counts: { duplicates: Number(c.duplicates), orderProblems: Number(c.problems) }, marked, problems };
}

/** Moves the rows to add into meter_reading; returns how many went in. */
export async function insertFromStaging(client: PoolClient, orgId: string, userId: string): Promise<number> {
  const res = await client.query(
    `insert into meter_reading (id, created_at, updated_at, organization_id, meter_id, value, read_at, source, is_reset, note, recorded_by_id, import_key)
     select id, now(), now(), $1, meter_id, value, read_at, 'import', is_reset, null, $2, decode(import_key, 'hex')
       from ${STAGING} s where not exists (select 1 from ${MARKS} m where m.line = s.line)
     on conflict (meter_id, read_at, import_key) do nothing`,
    [orgId, userId],
  );
  return res.rowCount ?? 0;
}
