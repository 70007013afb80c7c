import { createHash } from 'node:crypto';
import Papa from 'papaparse';
import type { EntityManager } from '@mikro-orm/postgresql';
import { Meter } from './meter.entity';
import { Organization } from '../organizations/organization.entity';
import type { Principal } from '../../http/principal';
import { badRequest } from '../../http/errors';
import { recordActivity } from '../activity-log/activity-log.service';
import { importKeySource, mapHeader, parseRow, templateCsv, type ParsedRow, type RowError } from '../../../shared/domain/counter-import';
import { readingOrderProblem, readingTime } from '../../../shared/domain/meters';
import type { ImportMeterSummary, ImportPreview, ImportResult } from '../../../shared/schemas/counter-import';
import type { MeterKind } from '../../../shared/schemas/machines';
import { clock } from '../../../shared/clock';

export type Progress = (p: { phase: 'reading' | 'checking' | 'writing'; done: number; total: number }) => void | Promise<void>;

type MeterInfo = { id: string; kind: MeterKind; unit: string; machineCode: string; code: string };
type Planned = ParsedRow & { meter: MeterInfo; key: string; status: 'add' | 'duplicate' | 'error' };
type Analysis = { preview: ImportPreview; toInsert: Planned[] };

const MAX_LISTED_ERRORS = 200;
const WRITE_CHUNK = 5000;
const tick = () => new Promise<void>((r) => setImmediate(r));

/**
 * Reads and checks a counter CSV without writing anything: header, each field, machine and
 * meter codes, units, readings already present, and the order of counts against the
 * readings around them (in the file and in the database).
 */
export async function analyseCounterCsv(em: EntityManager, who: Principal, file: Buffer, progress?: Progress): Promise<Analysis> {
  if (file.length === 0) throw badRequest('The file is empty', [{ path: 'file', message: 'The file is empty' }]);
  const text = file.toString('utf8');
  if (text.includes('\u0000')) throw badRequest('This is not a CSV text file', [{ path: 'file', message: 'Not a CSV text file' }]);
  const parsed = Papa.parse<string[]>(text, { skipEmptyLines: 'greedy' });
  const [header, ...lines] = parsed.data;
  if (!header) throw badRequest('The file has no header line', [{ path: 'file', message: 'No header line' }]);
  const { map, problems } = mapHeader(header);
  if (problems.length) {
    const message = `The columns do not match the counter import layout: ${problems.join('; ')}. Expected machine_code, meter_code, read_at, value and optionally reset, unit.`;
    throw badRequest(message, [{ path: 'file', message }]);
  }
  const org = await em.findOneOrFail(Organization, who.orgId);
  const meters = await em.find(Meter, {}, { populate: ['machine'] });
  const byCode = new Map<string, MeterInfo>();
  const machineCodes = new Set<string>();
  for (const m of meters) {
    const machineCode = m.machine.getEntity().code;
    machineCodes.add(machineCode.toLowerCase());
    byCode.set(`${machineCode.toLowerCase()}|${m.code.toLowerCase()}`, { id: m.id, kind: m.kind, unit: m.unit, machineCode, code: m.code });
  }

  const errors: RowError[] = [];
  const rows: Planned[] = [];
  const now = clock.now();
  // Papaparse's own complaints (an unclosed quote …) name the data row; the file line is one more.
  const csvErrors = new Map<number, string>();
  for (const e of parsed.errors) if (e.row !== undefined) csvErrors.set(e.row, e.message);
  for (let i = 0; i < lines.length; i++) {
    const line = i + 2;
    if (i % 20_000 === 0) {
      await progress?.({ phase: 'reading', done: i, total: lines.length });
      await tick();
    }
    const csvError = csvErrors.get(i + 1);
    if (csvError) {
      errors.push({ line, column: null, message: `Not valid CSV: ${csvError}` });
      continue;
    }
    const r = parseRow(lines[i], map, line, org.timeZone, now);
    if (Array.isArray(r)) {
      errors.push(...r);
      continue;
    }
    const meter = byCode.get(`${r.machineCode.toLowerCase()}|${r.meterCode.toLowerCase()}`);
    if (!meter) {
      errors.push(
        machineCodes.has(r.machineCode.toLowerCase())
          ? { line, column: 'meter_code', message: `Machine ${r.machineCode} has no meter “${r.meterCode}”` }
          : { line, column: 'machine_code', message: `No machine with the code “${r.machineCode}” in this shop` },
      );
      continue;
    }
    if (r.unit !== null && r.unit !== meter.unit) {
      errors.push({ line, column: 'unit', message: `Unit “${r.unit}” does not match meter ${meter.machineCode}/${meter.code}, which counts in ${meter.unit}` });
      continue;
    }
    const key = createHash('sha256').update(importKeySource(meter.id, r.readAt, r.value, r.reset)).digest('hex');
    rows.push({ ...r, meter, key, status: 'add' });
  }

  // Per meter: merge with what is stored around the file's time span and check the order.
  const perMeter = new Map<string, Planned[]>();
  for (const r of rows) {
    const list = perMeter.get(r.meter.id);
    if (list) list.push(r);
    else perMeter.set(r.meter.id, [r]);
  }
  let checked = 0;
  for (const [meterId, list] of perMeter) {
    list.sort((a, b) => a.readAt.getTime() - b.readAt.getTime() || a.line - b.line);
    const from = list[0].readAt;
    const to = list[list.length - 1].readAt;
    const stored: { read_at: Date; value: number; is_reset: boolean; import_key: string | null }[] = await em.execute(
      `(select read_at, value, is_reset, import_key from meter_reading where meter_id = ? and read_at < ? order by read_at desc limit 1)
       union all (select read_at, value, is_reset, import_key from meter_reading where meter_id = ? and read_at between ? and ?)
       union all (select read_at, value, is_reset, import_key from meter_reading where meter_id = ? and read_at > ? order by read_at asc limit 1)`,
      [meterId, from, meterId, from, to, meterId, to],
    );
    const storedKeys = new Set<string>();
    for (const s of stored) {
      storedKeys.add(s.import_key ?? '');
      storedKeys.add(createHash('sha256').update(importKeySource(meterId, new Date(s.read_at), Number(s.value), s.is_reset)).digest('hex'));
    }
    const seen = new Set<string>();
    for (const r of list) {
      if (storedKeys.has(r.key) || seen.has(r.key)) r.status = 'duplicate';
      seen.add(r.key);
    }
    type Point = { at: Date; value: number; isReset: boolean; row?: Planned };
    const points: Point[] = [
      ...stored.map((s): Point => ({ at: new Date(s.read_at), value: Number(s.value), isReset: s.is_reset })),
      ...list.filter((r) => r.status === 'add').map((r): Point => ({ at: r.readAt, value: r.value, isReset: r.reset, row: r })),
    ].sort((a, b) => a.at.getTime() - b.at.getTime() || (a.row ? 1 : 0) - (b.row ? 1 : 0));
    const meter = list[0].meter;
    for (let i = 0; i < points.length; i++) {
      const p = points[i];
      const prev = i > 0 ? points[i - 1] : null;
      if (p.row) {
        const problem = readingOrderProblem(meter.kind, prev, p, meter.unit, org.timeZone);
        if (problem) {
          errors.push({ line: p.row.line, column: 'value', message: `${meter.machineCode}/${meter.code}: ${problem}` });
          p.row.status = 'error';
        }
      } else if (prev?.row && prev.row.status === 'add' && readingOrderProblem(meter.kind, prev, p, meter.unit)) {
        errors.push({ line: prev.row.line, column: 'value', message: `${meter.machineCode}/${meter.code}: ${prev.value} ${meter.unit} is higher than the stored reading after it (${p.value} ${meter.unit} on ${readingTime(p.at, org.timeZone)})` });
        prev.row.status = 'error';
      }
    }
    checked += list.length;
    await progress?.({ phase: 'checking', done: checked, total: rows.length });
  }

  errors.sort((a, b) => a.line - b.line);
  const summaries: ImportMeterSummary[] = [...perMeter.values()].map((list) => ({
    machineCode: list[0].meter.machineCode,
    meterCode: list[0].meter.code,
    unit: list[0].meter.unit,
    rows: list.length,
    from: list[0].readAt.toISOString(),
    to: list[list.length - 1].readAt.toISOString(),
  }));
  const toInsert = rows.filter((r) => r.status === 'add');
  const bySample = [...rows].sort((a, b) => a.line - b.line).slice(0, 20);
  return {
    toInsert,
    preview: {
      rows: lines.length,
      columns: header.map((h, i) => ({ header: h, column: Object.entries(map).find(([, idx]) => idx === i)?.[0] ?? '' })),
      toAdd: toInsert.length,
      duplicates: rows.filter((r) => r.status === 'duplicate').length,
      errorCount: errors.length,
      errors: errors.slice(0, MAX_LISTED_ERRORS),
      meters: summaries,
      sample: bySample.map((r) => ({ line: r.line, machineCode: r.meter.machineCode, meterCode: r.meter.code, readAt: r.readAt.toISOString(), value: r.value, reset: r.reset, status: r.status })),
    },
  };
}

export async function previewCounterCsv(em: EntityManager, who: Principal, file: Buffer, progress?: Progress): Promise<ImportPreview> {
  return (await analyseCounterCsv(em, who, file, progress)).preview;
}

/**
 * Imports a counter CSV all-or-nothing: any row with a problem refuses the whole file.
 * Idempotent: each reading's key is a hash of meter, time, value and reset, so the same
 * readings imported again (from this file or another) add nothing.
 */
export async function importCounterCsv(em: EntityManager, who: Principal, file: Buffer, progress?: Progress): Promise<ImportResult> {
  return em.transactional(async (tx) => {
    // Lock the shop's meters so a reading typed in meanwhile cannot slip between check and write.
    await tx.execute('select id from meter where organization_id = ? order by id for update', [who.orgId]);
    const { preview, toInsert } = await analyseCounterCsv(tx, who, file, progress);
    if (preview.errorCount > 0) {
      const first = preview.errors.slice(0, 20).map((e) => ({ path: `line ${e.line}${e.column ? ` ${e.column}` : ''}`, message: e.message }));
      throw badRequest(`${preview.errorCount} problem${preview.errorCount === 1 ? '' : 's'} in the file; nothing was imported. First: line ${preview.errors[0].line}: ${preview.errors[0].message}`, first);
    }
    let added = 0;
    for (let i = 0; i < toInsert.length; i += WRITE_CHUNK) {
      const chunk = toInsert.slice(i, i + WRITE_CHUNK).map((r) => ({ m: r.meter.id, t: r.readAt.toISOString(), v: r.value, r: r.reset, k: r.key }));
      const res: { n: string }[] = await tx.execute(
        `with ins as (
           insert into meter_reading (id, created_at, updated_at, organization_id, meter_id, value, read_at, source, is_reset, note, recorded_by_id, import_key)
           select gen_random_uuid(), now(), now(), ?, x.m, x.v, x.t, 'import', x.r, null, ?, x.k
             from json_to_recordset(?::json) as x(m uuid, t timestamptz, v double precision, r boolean, k varchar(64))
           on conflict (meter_id, import_key) do nothing returning 1)
         select count(*) as n from ins`,
        [who.orgId, who.userId, JSON.stringify(chunk)],
      );
      added += Number(res[0].n);
      await progress?.({ phase: 'writing', done: Math.min(i + WRITE_CHUNK, toInsert.length), total: toInsert.length });
    }
    recordActivity(tx, who, 'meter.readings-imported', { type: 'CounterImport' }, { rows: preview.rows, added, duplicates: preview.duplicates + (toInsert.length - added), meters: preview.meters.map((m) => `${m.machineCode}/${m.meterCode}`) });
    return { rows: preview.rows, added, duplicates: preview.duplicates + (toInsert.length - added) };
  });
}

/** A CSV template whose example rows name this shop's own meters (or an invented one when it has none). */
export async function counterImportTemplate(em: EntityManager): Promise<string> {
  const meters = await em.find(Meter, {}, { populate: ['machine'], orderBy: { code: 'asc' }, limit: 3 });
  const examples = meters.length
    ? meters.map((m, i) => ({ machineCode: m.machine.getEntity().code, meterCode: m.code, unit: m.unit, value: m.kind === 'condition' ? 850 : (i + 1) * 12500 }))
    : [{ machineCode: 'C1-T', meterCode: 'arc-starts', unit: 'starts', value: 184220 }];
  return templateCsv(examples);
}
