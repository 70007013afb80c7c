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
      line integer not null, meter_id uuid not null, read_at timestamptz not null, value double precision not null,
      is_reset boolean not null, import_key varchar(64) not null,
      status text, problem text, other_at timestamptz, other_value double precision, other_is_reset boolean
    ) on commit drop`);
}

/** One staging row in COPY's text format (no field can hold a tab, newline or backslash). */
export const stagingLine = (line: number, meterId: string, readAt: Date, value: number, reset: boolean, key: string) =>
  `${line}\t${meterId}\t${readAt.toISOString()}\t${value}\t${reset ? 't' : 'f'}\t${key}\n`;

/** Streams COPY text from `lines` into the staging table, with the stream's back-pressure. */
export async function copyIntoStaging(client: PoolClient, lines: AsyncIterable<string>) {
  const copy = client.query(copyFrom(`copy ${STAGING} (line, meter_id, read_at, value, is_reset, import_key) from stdin`));
  await pipeline(Readable.from(lines, { objectMode: false }), copy);
  await client.query(`analyze ${STAGING}`);
}

/**
 * Marks a row as a duplicate when the same reading comes earlier in the file or is already
 * stored (same meter, time, value and reset: what the import key hashes). Compared on those
 * columns rather than the key text, whose collation-aware sort is slower; stored readings
 * are looked up only inside each meter's time span in the file.
 */
export async function markDuplicates(client: PoolClient) {
  await client.query(`update ${STAGING} s set status = 'duplicate'
      from (select line from (select line, row_number() over (partition by meter_id, read_at, value, is_reset order by line) as n from ${STAGING}) d where d.n > 1) d
     where s.line = d.line`);
  await client.query(`with spans as (select meter_id, min(read_at) as first_at, max(read_at) as last_at from ${STAGING} group by meter_id)
    update ${STAGING} s set status = 'duplicate'
      from spans p join meter_reading r on r.meter_id = p.meter_id and r.read_at between p.first_at and p.last_at
     where s.status is null and r.meter_id = s.meter_id and r.read_at = s.read_at and r.value = s.value and r.is_reset = s.is_reset`);
}

/**
 * Per meter, merges the rows to add with the stored readings in the file's time span and the
 * stored one just before and just after it, ordered by time (stored first, then file order),
 * and marks a row whose counter runs backwards against the point before it ('before': lower
 * than it, or negative), or, failing that, against a stored reading right after it ('after').
 * Condition meters may move both ways. The neighbour's time and value are kept for the message.
 */
export async function markOrderProblems(client: PoolClient) {
  await client.query(`
    with spans as (
      select meter_id, min(read_at) as first_at, max(read_at) as last_at from ${STAGING} group by meter_id
    ), stored as (
      select r.meter_id, r.read_at, r.value, r.is_reset
        from spans p join meter_reading r on r.meter_id = p.meter_id and r.read_at between p.first_at and p.last_at
      union all
      select p.meter_id, b.read_at, b.value, b.is_reset from spans p cross join lateral
        (select r.read_at, r.value, r.is_reset from meter_reading r where r.meter_id = p.meter_id and r.read_at < p.first_at order by r.read_at desc limit 1) b
      union all
      select p.meter_id, a.read_at, a.value, a.is_reset from spans p cross join lateral
        (select r.read_at, r.value, r.is_reset from meter_reading r where r.meter_id = p.meter_id and r.read_at > p.last_at order by r.read_at asc limit 1) a
    ), points as (
      select meter_id, read_at, value, is_reset, null::integer as line from stored
      union all
      select meter_id, read_at, value, is_reset, line from ${STAGING} where status is null
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
    ), problems as (
      select line, 'before' as problem, prev_at as other_at, prev_value as other_value, prev_is_reset as other_is_reset
        from judged where before_bad
      union all
      select line, 'after', next_at, next_value, next_is_reset
        from judged
       where not before_bad and cumulative and next_at is not null and next_line is null
         and (next_value < 0 or (not next_is_reset and next_value < value))
    )
    update ${STAGING} s set status = 'error', problem = p.problem, other_at = p.other_at, other_value = p.other_value, other_is_reset = p.other_is_reset
      from problems p where s.line = p.line`);
}

export type StagingSummary = {
  counts: { toAdd: number; duplicates: number; orderProblems: number };
  meters: { meterId: string; rows: number; from: Date; to: Date }[];
  sample: { line: number; meterId: string; readAt: Date; value: number; reset: boolean; status: 'add' | 'duplicate' | 'error' }[];
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

/** What the preview shows: counts, per-meter spans, the first rows and the first order problems. */
export async function summariseStaging(client: PoolClient, maxProblems: number, sampleRows: number): Promise<StagingSummary> {
  const counts = await client.query<{ to_add: string; duplicates: string; problems: string }>(
    `select count(*) filter (where status is null) as to_add, count(*) filter (where status = 'duplicate') as duplicates,
            count(*) filter (where status = 'error') as problems from ${STAGING}`,
  );
  const meters = await client.query<{ meter_id: string; rows: string; first_at: Date; last_at: Date }>(
    `select meter_id, count(*) as rows, min(read_at) as first_at, max(read_at) as last_at from ${STAGING} group by meter_id order by min(line)`,
  );
  const sample = await client.query<{ line: number; meter_id: string; read_at: Date; value: number; is_reset: boolean; status: string | null }>(
    `select line, meter_id, read_at, value, is_reset, status from ${STAGING} order by line limit $1`,
    [sampleRows],
  );
  const problems = await client.query<{
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
    `select line, meter_id, read_at, value, is_reset, problem, other_at, other_value, other_is_reset from ${STAGING} where status = 'error' order by line limit $1`,
    [maxProblems],
  );
  const c = counts.rows[0];
  return {
    counts: { toAdd: Number(c.to_add), duplicates: Number(c.duplicates), orderProblems: Number(c.problems) },
    meters: meters.rows.map((m) => ({ meterId: m.meter_id, rows: Number(m.rows), from: new Date(m.first_at), to: new Date(m.last_at) })),
    sample: sample.rows.map((r) => ({
      line: r.line,
      meterId: r.meter_id,
      readAt: new Date(r.read_at),
      value: Number(r.value),
      reset: r.is_reset,
      status: (r.status ?? 'add') as 'add' | 'duplicate' | 'error',
    })),
    problems: problems.rows.map((r) => ({
      line: r.line,
      meterId: r.meter_id,
      readAt: new Date(r.read_at),
      value: Number(r.value),
      reset: r.is_reset,
      problem: r.problem,
      otherAt: r.other_at === null ? null : new Date(r.other_at),
      otherValue: r.other_value === null ? null : Number(r.other_value),
      otherIsReset: r.other_is_reset,
    })),
  };
}

/** Moves the rows to add into meter_reading; returns how many went in. */
export async function insertFromStaging(client: PoolClient, orgId: string, userId: string): Promise<number> {
  const res = await client.query(
    `insert into meter_reading (id, created_at, updated_at, organization_id, meter_id, value, read_at, source, is_reset, note, recorded_by_id, import_key)
     select gen_random_uuid(), now(), now(), $1, meter_id, value, read_at, 'import', is_reset, null, $2, import_key
       from ${STAGING} where status is null
     on conflict (meter_id, import_key) do nothing`,
    [orgId, userId],
  );
  return res.rowCount ?? 0;
}
