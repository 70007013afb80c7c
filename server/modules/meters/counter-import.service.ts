import { convertUnit, quantityOf } from '../../../shared/domain/units';
import { hash } from 'node:crypto';
import { checkCounterAdvances } from '../safety/lockout-alarms';
import type { PoolClient } from 'pg';
import type { EntityManager } from '@mikro-orm/postgresql';
import { Meter } from './meter.entity';
import { Organization } from '../organizations/organization.entity';
import type { Principal } from '../../http/principal';
import { badRequest } from '../../http/errors';
import { recordActivity } from '../activity-log/activity-log.service';
import { importKeySourceIso, mapHeader, parseRow, templateCsv, type CounterColumn, type RowError } from '../../../shared/domain/counter-import';
import { readingOrderProblem } from '../../../shared/domain/meters';
import { formatDateTime, type ShopClock } from '../../../shared/locale';
import type { ImportPreview, ImportResult } from '../../../shared/schemas/counter-import';
import type { MeterKind } from '../../../shared/schemas/machines';
import { clock } from '../../../shared/clock';
import { batchIds } from '../common/batch-ids';
import { readCsvRecords, type CsvBatch, type CsvRecord } from './csv-records';
import {
  copyIntoStaging,
  createStaging,
  insertFromStaging,
  checkStaging,
  copyIntoReadings,
  createBatchView,
  dropBatchView,
  readingLine,
  removeMarkedDuplicates,
  stagingLine,
  type BatchRange,
  summariseStaging,
  transactionClient,
  type StagingSummary,
} from './counter-import-staging';

export type Progress = (p: { phase: 'reading' | 'checking' | 'writing'; done: number; total: number }) => void | Promise<void>;

type MeterInfo = { id: string; kind: MeterKind; unit: string; machineCode: string; code: string };

const MAX_LISTED_ERRORS = 200;
const SAMPLE_ROWS = 20;

/** Pulls records one at a time out of the chunked reader, keeping the reading progress. */
class RecordCursor {
  private batch: CsvRecord[] = [];
  private at = 0;
  bytesRead = 0;
  totalBytes = 0;
  constructor(private readonly batches: AsyncIterator<CsvBatch>) {}
  async nextBatch(): Promise<CsvRecord[] | null> {
    if (this.at < this.batch.length) {
      const rest = this.batch.slice(this.at);
      this.at = this.batch.length;
      return rest;
    }
    const next = await this.batches.next();
    if (next.done) return null;
    this.bytesRead = next.value.bytesRead;
    this.totalBytes = next.value.totalBytes;
    this.batch = next.value.records;
    this.at = this.batch.length;
    return this.batch;
  }
  /** The first record, leaving the rest of its batch for `nextBatch`. */
  async first(): Promise<CsvRecord | null> {
    for (;;) {
      const next = await this.batches.next();
      if (next.done) return null;
      this.bytesRead = next.value.bytesRead;
      this.totalBytes = next.value.totalBytes;
      if (next.value.records.length) {
        this.batch = next.value.records;
        this.at = 1;
        return this.batch[0];
      }
    }
  }
}

/** The first problems by line (all a preview lists) and how many there are in all. */
class ProblemList {
  readonly listed: RowError[] = [];
  count = 0;
  add(errors: RowError[]) {
    this.count += errors.length;
    for (const e of errors) if (this.listed.length < MAX_LISTED_ERRORS) this.listed.push(e);
  }
}

/**
 * Reads and checks a counter CSV without keeping it in memory: header first, then each
 * record as it streams in (fields, machine and meter codes, units) — rows that pass go by
 * COPY into a staging table — then, in SQL, readings already present and the order of counts
 * against the readings around them (in the file and in the database). Runs inside `tx`;
 * writes nothing but the staging table, which the transaction's end drops.
 */
export async function analyseCounterCsv(
  tx: EntityManager,
  who: Principal,
  filePath: string,
  progress?: Progress,
  sink: 'staging' | 'readings' = 'staging',
): Promise<{ preview: ImportPreview; client: PoolClient; batch: BatchRange } | null> {
  const cursor = new RecordCursor(readCsvRecords(filePath)[Symbol.asyncIterator]());
  const headerRecord = await cursor.first();
  if (!headerRecord) throw badRequest('The file has no header line', [{ path: 'file', message: 'No header line' }]);
  const header = headerRecord.cells;
  const { map, problems: headerProblems } = mapHeader(header);
  if (headerProblems.length) {
    const message = `The columns do not match the counter import layout: ${headerProblems.join('; ')}. Expected machine_code, meter_code, read_at, value and optionally reset, unit.`;
    throw badRequest(message, [{ path: 'file', message }]);
  }
  const org = await tx.findOneOrFail(Organization, who.orgId);
  const meters = await tx.find(Meter, {}, { populate: ['machine'] });
  const byCode = new Map<string, MeterInfo>();
  const byId = new Map<string, MeterInfo>();
  const machineCodes = new Set<string>();
  for (const m of meters) {
    const machineCode = m.machine.getEntity().code;
    machineCodes.add(machineCode.toLowerCase());
    const info = { id: m.id, kind: m.kind, unit: m.unit, machineCode, code: m.code };
    byCode.set(`${machineCode.toLowerCase()}|${m.code.toLowerCase()}`, info);
    byId.set(m.id, info);
  }

  const client = await transactionClient(tx);
  if (sink === 'staging') await createStaging(client);
  const rowProblems = new ProblemList();
  const now = clock.now();
  // Time-ordered ids, numbered by line: the primary key's index grows at one edge.
  const readingId = batchIds(now);
  const writtenAt = sink === 'readings' ? (await client.query<{ at: string }>('select now()::text as at')).rows[0].at : '';
  let rows = 0;
  // Kept while reading, so the preview needs no further pass over the staged rows.
  const spans = new Map<string, { rows: number; from: Date; to: Date }>();
  const sampleRows: { line: number; meterId: string; readAt: Date; value: number; reset: boolean }[] = [];
  let staged = 0;
  /** COPY text, a chunk of the file at a time; rows with a problem are listed and left out. */
  async function* stagingText(): AsyncGenerator<string> {
    for (let records = await cursor.nextBatch(); records; records = await cursor.nextBatch()) {
      let text = '';
      for (const record of records) {
        rows++;
        const line = rows + 1;
        const problem = checkRecord(record, line);
        if (Array.isArray(problem)) rowProblems.add(problem);
        else text += problem;
      }
      if (text) yield text;
      await progress?.({ phase: 'reading', done: cursor.bytesRead, total: cursor.totalBytes });
    }
  }
  function checkRecord(record: CsvRecord, line: number): RowError[] | string {
    if (record.csvError) return [{ line, column: null, message: `Not valid CSV: ${record.csvError}` }];
    const r = parseRow(record.cells, map, line, org.timeZone, now);
    if (Array.isArray(r)) return r;
    const meter = byCode.get(`${r.machineCode.toLowerCase()}|${r.meterCode.toLowerCase()}`);
    if (!meter) {
      return [
        machineCodes.has(r.machineCode.toLowerCase())
          ? { line, column: 'meter_code', message: `Machine ${r.machineCode} has no meter “${r.meterCode}”` }
          : { line, column: 'machine_code', message: `No machine with the code “${r.machineCode}” in this shop` },
      ];
    }
    let value = r.value;
    if (r.unit !== null && r.unit !== meter.unit) {
      // Another unit of the same quantity is converted into the meter's own (NIST SP 811 factors, shared/domain/units.ts).
      try {
        value = convertUnit(r.value, r.unit, meter.unit);
      } catch (err) {
        const why = quantityOf(meter.unit) === null ? '' : ` (${err instanceof Error ? err.message : String(err)})`;
        return [
          { line, column: 'unit', message: `Unit “${r.unit}” does not match meter ${meter.machineCode}/${meter.code}, which counts in ${meter.unit}${why}` },
        ];
      }
    }
    const readAtIso = r.readAt.toISOString();
    const key = hash('sha256', importKeySourceIso(meter.id, readAtIso, value, r.reset), 'hex');
    staged++;
    const span = spans.get(meter.id);
    if (!span) spans.set(meter.id, { rows: 1, from: r.readAt, to: r.readAt });
    else {
      span.rows++;
      if (r.readAt < span.from) span.from = r.readAt;
      if (r.readAt > span.to) span.to = r.readAt;
    }
    if (sampleRows.length < SAMPLE_ROWS) sampleRows.push({ line, meterId: meter.id, readAt: r.readAt, value, reset: r.reset });
    return sink === 'staging'
      ? stagingLine(line, readingId(line), meter.id, readAtIso, value, r.reset, key)
      : readingLine(readingId(line), writtenAt, who.orgId, meter.id, readAtIso, value, r.reset, who.userId, key);
  }
  if (sink === 'staging') await copyIntoStaging(client, stagingText());
  else {
    // A reading stored before (or twice in the file) breaks the unique key; the caller then takes the staging way.
    await client.query('savepoint counter_import_direct');
    try {
      await copyIntoReadings(client, stagingText());
    } catch (err) {
      if ((err as { code?: string }).code !== '23505') throw err;
      await client.query('rollback to savepoint counter_import_direct');
      return null;
    }
    await client.query('release savepoint counter_import_direct');
  }
  const batch = { first: readingId(0), last: readingId(Math.max(rows + 1, 1)) };
  if (sink === 'readings') await createBatchView(client, batch);

  await progress?.({ phase: 'checking', done: 0, total: 1 });
  await checkStaging(client, batch);
  const found = await summariseStaging(
    client,
    MAX_LISTED_ERRORS,
    sampleRows.map((r) => r.line),
  );
  await progress?.({ phase: 'checking', done: 1, total: 1 });

  const meterOf = (id: string) => byId.get(id)!;
  const errors = [...rowProblems.listed, ...found.problems.map((p) => orderMessage(p, meterOf(p.meterId), { timeZone: org.timeZone, locale: who.locale }))]
    .sort((a, b) => a.line - b.line)
    .slice(0, MAX_LISTED_ERRORS);
  return {
    client,
    batch,
    preview: {
      rows,
      columns: header.map((h, i) => ({ header: h, column: (Object.entries(map) as [CounterColumn, number][]).find(([, idx]) => idx === i)?.[0] ?? '' })),
      toAdd: staged - found.counts.duplicates - found.counts.orderProblems,
      duplicates: found.counts.duplicates,
      errorCount: rowProblems.count + found.counts.orderProblems,
      errors,
      meters: [...spans].map(([meterId, m]) => ({
        machineCode: meterOf(meterId).machineCode,
        meterCode: meterOf(meterId).code,
        unit: meterOf(meterId).unit,
        rows: m.rows,
        from: m.from.toISOString(),
        to: m.to.toISOString(),
      })),
      sample: sampleRows.map((r) => ({
        line: r.line,
        machineCode: meterOf(r.meterId).machineCode,
        meterCode: meterOf(r.meterId).code,
        readAt: r.readAt.toISOString(),
        value: r.value,
        reset: r.reset,
        status: found.marked.get(r.line) ?? 'add',
      })),
    },
  };
}

/** The message for a count that runs backwards, worded by the same rule the meter page uses. */
function orderMessage(p: StagingSummary['problems'][number], meter: MeterInfo, shop: ShopClock): RowError {
  const name = `${meter.machineCode}/${meter.code}`;
  if (p.problem === 'before') {
    const prev = p.otherAt ? { at: p.otherAt, value: p.otherValue!, isReset: p.otherIsReset! } : null;
    const problem = readingOrderProblem(meter.kind, prev, { at: p.readAt, value: p.value, isReset: p.reset }, meter.unit, shop);
    return { line: p.line, column: 'value', message: `${name}: ${problem}` };
  }
  return {
    line: p.line,
    column: 'value',
    message: `${name}: ${p.value} ${meter.unit} is higher than the stored reading after it (${p.otherValue} ${meter.unit} on ${formatDateTime(p.otherAt!, shop)})`,
  };
}

export async function previewCounterCsv(em: EntityManager, who: Principal, filePath: string, progress?: Progress): Promise<ImportPreview> {
  // The staging table lives in a transaction; it holds nothing but the staging table.
  return em.transactional(async (tx) => (await analyseCounterCsv(tx, who, filePath, progress))!.preview);
}

/**
 * Imports a counter CSV all-or-nothing: any row with a problem refuses the whole file.
 * Idempotent: each reading's key is a hash of meter, time, value and reset, so the same
 * readings imported again (from this file or another) add nothing.
 */
export async function importCounterCsv(em: EntityManager, who: Principal, filePath: string, progress?: Progress): Promise<ImportResult> {
  return em.transactional(async (tx) => {
    // Lock the shop's meters so a reading typed in meanwhile cannot slip between check and write.
    await tx.execute('select id from meter where organization_id = ? order by id for update', [who.orgId]);
    // First straight into meter_reading, checked where the rows landed, which holds for a file of new
    // readings; a file with readings already stored goes through the staging table.
    const direct = await analyseCounterCsv(tx, who, filePath, progress, 'readings');
    const { preview, client, batch } = direct ?? (await analyseCounterCsv(tx, who, filePath, progress, 'staging'))!;
    if (preview.errorCount > 0) {
      const first = preview.errors.slice(0, 20).map((e) => ({ path: `line ${e.line}${e.column ? ` ${e.column}` : ''}`, message: e.message }));
      throw badRequest(
        `${preview.errorCount} problem${preview.errorCount === 1 ? '' : 's'} in the file; nothing was imported. First: line ${preview.errors[0].line}: ${preview.errors[0].message}`,
        first,
      );
    }
    await progress?.({ phase: 'writing', done: 0, total: preview.toAdd });
    let added: number;
    if (direct) {
      added = preview.toAdd + preview.duplicates - (await removeMarkedDuplicates(client, batch));
      await dropBatchView(client);
    } else added = await insertFromStaging(client, who.orgId, who.userId);
    await progress?.({ phase: 'writing', done: preview.toAdd, total: preview.toAdd });
    const duplicates = preview.duplicates + (preview.toAdd - added);
    if (added > 0) await checkCounterAdvances(tx, who.orgId, 'all-locked');
    recordActivity(
      tx,
      who,
      'meter.readings-imported',
      { type: 'CounterImport' },
      { rows: preview.rows, added, duplicates, meters: preview.meters.map((m) => `${m.machineCode}/${m.meterCode}`) },
    );
    return { rows: preview.rows, added, duplicates };
  });
}

/** A CSV template whose example rows name this shop's own meters (or an invented one when it has none). */
export async function counterImportTemplate(em: EntityManager): Promise<string> {
  const meters = await em.find(Meter, {}, { populate: ['machine'], orderBy: { code: 'asc' }, limit: 3 });
  const examples = meters.length
    ? meters.map((m, i) => ({
        machineCode: m.machine.getEntity().code,
        meterCode: m.code,
        unit: m.unit,
        value: m.kind === 'condition' ? 850 : (i + 1) * 12500,
      }))
    : [{ machineCode: 'C1-T', meterCode: 'arc-starts', unit: 'starts', value: 184220 }];
  return templateCsv(examples);
}
