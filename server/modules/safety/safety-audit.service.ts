// Over 400 lines: the sign-off list, the timeline, compliance and the CSV/PDF exports read the same filtered rows; the exports are the seam to split along next.
import type { EntityManager } from '@mikro-orm/postgresql';
import { toCsv } from '../../../shared/domain/csv';
import { formatDateTime } from '../../../shared/locale';
import { DateTime } from 'luxon';
import { Organization } from '../organizations/organization.entity';
import { Machine } from '../machines/machine.entity';
import { preUseCompliance } from './pre-use-checks.service';
import { EnergyProcedure, ProcedureVersion } from './procedure.entity';
import { LockoutSession } from './lockout.entity';
import { PeriodicInspection, PpeCheck, PpeRequirement } from './records.entity';
import { verifyShopChain } from './chain';
import { inspectionEvaluation, ppeOccurrences } from './due';
import { safetySettingsOf } from './settings';
import { listTraining } from './records.service';
import { COLORS, newDoc, pdfText, stampPages, toBuffer } from './pdf';
import { notFound } from '../../http/errors';
import { ROLE_LABELS, type Role } from '../../../shared/permissions';
import type { Principal } from '../../http/principal';
import {
  MEANING_LABELS,
  type ChainVerification,
  type ExportSignOffsQuery,
  type ListSignOffsQuery,
  type SignOffRow,
} from '../../../shared/schemas/safety-sign-offs';
import type { ComplianceSummary, MachineCompliance, TimelineWeek } from '../../../shared/schemas/safety-audit';
import { clock } from '../../../shared/clock';
import type { Page } from '../../../shared/schemas/paging';

const SORT: Record<ListSignOffsQuery['sort'], string> = {
  signedAt: 's.signed_at',
  signerName: 's.signer_name',
  meaning: 's.meaning',
  machine: 'm.code',
  seq: 's.seq',
};

type Sql = {
  id: string;
  seq: number;
  signed_at: Date;
  signer_id: string;
  signer_name: string;
  signer_role: string;
  meaning: SignOffRow['meaning'];
  statement: string;
  subject_type: string;
  subject_id: string;
  machine_id: string | null;
  machine_code: string | null;
  machine_name: string | null;
  details: { summary?: string };
  note: string | null;
  corrects_id: string | null;
  corrects_seq: number | null;
  corrected_by: number[] | null;
  hash: string;
  total: string;
};

async function shopZone(em: EntityManager, orgId: string) {
  const org = await em.findOneOrFail(Organization, orgId);
  return { org, tz: org.timeZone };
}

function whereFor(q: ExportSignOffsQuery, orgId: string, tz: string) {
  const params: unknown[] = [orgId];
  let where = 's.organization_id = ?';
  const add = (clause: string, value: unknown) => {
    where += ` and ${clause}`;
    params.push(value);
  };
  if (q.machineId) add('s.machine_id = ?', q.machineId);
  if (q.signerId) add('s.signer_id = ?', q.signerId);
  if (q.meaning) add('s.meaning = ?', q.meaning);
  // Dates are the shop's calendar days.
  if (q.from) add('s.signed_at >= ?', DateTime.fromISO(q.from, { zone: tz }).startOf('day').toJSDate());
  if (q.to) add('s.signed_at < ?', DateTime.fromISO(q.to, { zone: tz }).plus({ days: 1 }).startOf('day').toJSDate());
  return { where, params };
}

const selectSql = `select s.*, m.code as machine_code, m.name as machine_name, c.seq as corrects_seq,
    array(select x.seq from safety_sign_off x where x.corrects_id = s.id order by x.seq) as corrected_by, count(*) over () as total
  from safety_sign_off s left join machine m on m.id = s.machine_id left join safety_sign_off c on c.id = s.corrects_id`;

const toRow = (r: Sql): SignOffRow => ({
  id: r.id,
  seq: Number(r.seq),
  signedAt: new Date(r.signed_at).toISOString(),
  signerId: r.signer_id,
  signerName: r.signer_name,
  signerRole: r.signer_role,
  meaning: r.meaning,
  statement: r.statement,
  subjectType: r.subject_type,
  subjectId: r.subject_id,
  machineId: r.machine_id,
  machineCode: r.machine_code,
  machineName: r.machine_name,
  summary: String(r.details?.summary ?? ''),
  note: r.note,
  correctsId: r.corrects_id,
  correctsSeq: r.corrects_seq === null ? null : Number(r.corrects_seq),
  correctedBy: (r.corrected_by ?? []).map(Number),
  hash: r.hash,
});

export async function listSignOffs(em: EntityManager, who: Principal, q: ListSignOffsQuery): Promise<Page<SignOffRow>> {
  const tz = who.timeZone;
  const { where, params } = whereFor(q, who.orgId, tz);
  const rows = await em
    .getConnection()
    .execute<Sql[]>(
      `${selectSql} where ${where} order by ${SORT[q.sort]} ${q.dir === 'asc' ? 'asc' : 'desc'}, s.seq ${q.dir === 'asc' ? 'asc' : 'desc'} limit ? offset ?`,
      [...params, q.pageSize, (q.page - 1) * q.pageSize],
    );
  return { rows: rows.map(toRow), total: rows[0] ? Number(rows[0].total) : 0, page: q.page, pageSize: q.pageSize };
}

async function allRows(em: EntityManager, who: Principal, q: ExportSignOffsQuery, tz: string) {
  const { where, params } = whereFor(q, who.orgId, tz);
  const rows = await em
    .getConnection()
    .execute<Sql[]>(`${selectSql} where ${where} order by ${SORT[q.sort]} ${q.dir === 'asc' ? 'asc' : 'desc'}, s.seq limit 20000`, params);
  return rows.map(toRow);
}

/** Per-row chain status for exports: verified up to the first bad record, not verifiable after it. */
function chainStatus(v: ChainVerification, seq: number) {
  if (v.ok) return 'verified';
  const bad = v.firstBad?.seq ?? Infinity;
  if (seq < bad) return 'verified';
  if (seq === bad) return v.problem === 'content-altered' ? 'ALTERED' : 'LINK BROKEN';
  return 'not verifiable (after the break)';
}

async function filterText(em: EntityManager, q: ExportSignOffsQuery) {
  const parts: string[] = [];
  if (q.machineId) {
    const m = await em.findOne(Machine, q.machineId);
    if (!m) throw notFound('Machine');
    parts.push(`machine ${m.code}`);
  }
  if (q.signerId) {
    const [u] = await em.getConnection().execute<{ name: string }[]>('select name from app_user where id = ?', [q.signerId]);
    parts.push(`signer ${u?.name ?? 'unknown'}`);
  }
  if (q.meaning) parts.push(`meaning “${MEANING_LABELS[q.meaning]}”`);
  if (q.from) parts.push(`from ${q.from}`);
  if (q.to) parts.push(`to ${q.to}`);
  return parts.length ? parts.join(', ') : 'all signatures';
}

export async function exportCsv(
  em: EntityManager,
  who: Principal,
  q: ExportSignOffsQuery,
): Promise<{ csv: string; fileName: string; verification: ChainVerification }> {
  const org = await em.findOneOrFail(Organization, who.orgId);
  const tz = who.timeZone;
  const verification = await verifyShopChain(em, who.orgId);
  const rows = await allRows(em, who, q, tz);
  const csv = toCsv(
    [
      'seq',
      'signed_at_utc',
      'signed_at_local',
      'time_zone',
      'printed_name',
      'role',
      'meaning',
      'statement',
      'machine',
      'summary',
      'note',
      'corrects_seq',
      'hash',
      'chain_check',
    ],
    rows.map((r) => [
      r.seq,
      r.signedAt,
      DateTime.fromISO(r.signedAt, { zone: tz }).toFormat('yyyy-LL-dd HH:mm:ss'),
      tz,
      r.signerName,
      ROLE_LABELS[r.signerRole as Role] ?? r.signerRole,
      MEANING_LABELS[r.meaning],
      r.statement,
      r.machineCode ?? '',
      r.summary,
      r.note ?? '',
      r.correctsSeq ?? '',
      r.hash,
      chainStatus(verification, r.seq),
    ]),
  );
  const stamp = DateTime.fromMillis(clock.ms()).setZone(tz).toFormat('yyyyLLdd-HHmm');
  return { csv: `\uFEFF${csv}\r\n`, fileName: `safety-sign-offs-${org.slug}-${stamp}.csv`, verification };
}

export async function exportPdf(em: EntityManager, who: Principal, q: ExportSignOffsQuery): Promise<{ pdf: Buffer; fileName: string }> {
  const org = await em.findOneOrFail(Organization, who.orgId);
  const tz = who.timeZone;
  const verification = await verifyShopChain(em, who.orgId);
  const rows = await allRows(em, who, q, tz);
  const filters = await filterText(em, q);
  const doc = newDoc({ Title: `Safety sign-offs — ${org.name}`, Subject: filters }, 'landscape');
  const W = doc.page.width;
  const M = 36;
  const inner = W - 2 * M;
  const generated = DateTime.fromMillis(clock.ms()).setZone(tz);

  doc.rect(0, 0, W, 6).fill(COLORS.steel900);
  doc
    .fillColor(COLORS.steel900)
    .font('bold')
    .fontSize(18)
    .text(pdfText(`Safety sign-offs — ${org.name}`), M, 20);
  doc
    .font('regular')
    .fontSize(9.5)
    .fillColor(COLORS.steel700)
    .text(
      pdfText(
        `Filters: ${filters}  ·  ${rows.length} signature${rows.length === 1 ? '' : 's'}  ·  generated ${formatDateTime(generated.toMillis(), who)} (${tz}) by ${who.name}`,
      ),
      M,
      doc.y + 2,
    );

  // The verification result, in words and in colour (green = intact, red = broken).
  let y = doc.y + 8;
  const tone = verification.ok ? COLORS.safe : COLORS.danger;
  const vText = verification.ok
    ? `CHAIN VERIFIED — all ${verification.total} signatures of the shop are intact and in order (SHA-256 hash chain, head #${verification.headSeq}).`
    : `CHAIN BROKEN — ${verification.message} Signatures after the break cannot be vouched for.`;
  doc.font('bold').fontSize(11);
  const vh = doc.heightOfString(pdfText(vText), { width: inner - 24 }) + 14;
  doc.rect(M, y, inner, vh).fill(verification.ok ? '#e3f5e9' : '#fde8e8');
  doc.rect(M, y, 8, vh).fill(tone);
  doc.fillColor(verification.ok ? '#0d4f26' : '#7f1212').text(pdfText(vText), M + 16, y + 7, { width: inner - 24 });
  y += vh + 10;

  const cols = [
    { h: '#', w: 34 },
    { h: `Signed (${tz})`, w: 92 },
    { h: 'Printed name', w: 100 },
    { h: 'Role', w: 70 },
    { h: 'Meaning', w: 104 },
    { h: 'Machine', w: 48 },
    { h: 'What was signed', w: inner - 34 - 92 - 100 - 70 - 104 - 48 - 70 - 62 },
    { h: 'Hash', w: 70 },
    { h: 'Chain', w: 62 },
  ];
  const header = () => {
    doc.rect(M, y, inner, 16).fill(COLORS.steel900);
    let x = M;
    doc.font('bold').fontSize(8).fillColor('#ffffff');
    for (const c of cols) {
      doc.text(pdfText(c.h), x + 3, y + 4, { width: c.w - 6, lineBreak: false, height: 10 });
      x += c.w;
    }
    y += 16;
  };
  header();
  rows.forEach((r, i) => {
    const cells = [
      String(r.seq),
      formatDateTime(r.signedAt, who, { seconds: true }),
      r.signerName,
      ROLE_LABELS[r.signerRole as Role] ?? r.signerRole,
      MEANING_LABELS[r.meaning] + (r.correctsSeq ? ` (corrects #${r.correctsSeq})` : ''),
      r.machineCode ?? '—',
      r.summary + (r.note ? ` — Note: ${r.note}` : ''),
      r.hash.slice(0, 16),
      chainStatus(verification, r.seq),
    ].map(pdfText);
    doc.font('regular').fontSize(7.5);
    const h = Math.max(...cells.map((c, j) => doc.heightOfString(c, { width: cols[j].w - 6 }))) + 6;
    if (y + h > doc.page.height - 40) {
      doc.addPage();
      y = M;
      header();
    }
    if (i % 2 === 1) doc.rect(M, y, inner, h).fill(COLORS.steel100);
    let x = M;
    cells.forEach((c, j) => {
      const bad = j === 8 && c !== 'verified';
      doc
        .font(j === 2 || bad ? 'bold' : 'regular')
        .fontSize(7.5)
        .fillColor(bad ? COLORS.danger : COLORS.steel900)
        .text(c, x + 3, y + 3, { width: cols[j].w - 6 });
      x += cols[j].w;
    });
    y += h;
  });
  if (rows.length === 0)
    doc
      .font('regular')
      .fontSize(10)
      .fillColor(COLORS.steel700)
      .text('No signatures match these filters.', M, y + 8);
  stampPages(doc, `Kerfbook safety log · ${org.name} · ${filters} · each signature was confirmed by the signer's password at the time shown`);
  const pdf = await toBuffer(doc);
  return { pdf, fileName: `safety-sign-offs-${org.slug}-${generated.toFormat('yyyyLLdd-HHmm')}.pdf` };
}

type Inputs = Awaited<ReturnType<typeof loadInputs>>;
async function loadInputs(em: EntityManager, orgId: string) {
  const { org, tz } = await shopZone(em, orgId);
  const settings = safetySettingsOf(org);
  const machines = await em.find(Machine, { active: true, parent: null }, { orderBy: { code: 'asc' } });
  const procs = await em.find(EnergyProcedure, {});
  const versions = await em.find(ProcedureVersion, { status: { $in: ['approved', 'superseded'] } }, { orderBy: { version: 'asc' } });
  const inspections = await em.find(PeriodicInspection, { certifiedAt: { $ne: null } }, { orderBy: { inspectedOn: 'asc' } });
  const reqs = await em.find(PpeRequirement, { active: true });
  return { org, tz, settings, machines, procs, versions, inspections, reqs };
}

const RANK = { none: 0, 'not-due': 1, 'due-soon': 2, due: 3, overdue: 4 } as const;

function inspectionState(inp: Inputs, procId: string, at: Date) {
  const mine = inp.versions.filter((v) => v.procedure.id === procId && v.approvedAt && v.approvedAt <= at);
  const first = mine[0]?.approvedAt;
  if (!first) return null;
  const last = inp.inspections.filter((i) => i.procedure.id === procId && DateTime.fromISO(i.inspectedOn, { zone: inp.tz }).toJSDate() <= at).at(-1);
  const ev = inspectionEvaluation({
    firstApprovedAt: first,
    lastInspectedOn: last?.inspectedOn ?? null,
    months: inp.settings.inspectionIntervalMonths,
    timeZone: inp.tz,
    now: at,
  });
  return {
    status: ev.status,
    dueAt: ev.dueAt,
    last: last?.inspectedOn ?? null,
    version: mine.filter((v) => v.status === 'approved').at(-1)?.version ?? mine.at(-1)?.version ?? null,
  };
}

/** Per-machine state: overdue inspections, missed PPE checks in the window, open lockouts, retraining. */
export async function compliance(em: EntityManager, who: Principal, days: number): Promise<ComplianceSummary> {
  const inp = await loadInputs(em, who.orgId);
  const now = clock.now();
  const from = new Date(now.getTime() - days * 86_400_000);
  const checks = await em.find(PpeCheck, { checkedAt: { $gte: new Date(from.getTime() - 7 * 86_400_000) } });
  const open = await em.find(LockoutSession, { state: { $ne: 'released' } });
  const training = await listTraining(em);
  // Today's pre-use check: "today" is the signed-in person's shop day in the shop's zone.
  const preUse = await preUseCompliance(em, who.timeZone, inp.machines);
  const machines: MachineCompliance[] = inp.machines.map((m) => {
    let status: MachineCompliance['inspectionStatus'] = 'none';
    let dueAt: Date | null = null;
    let last: string | null = null;
    let version: number | null = null;
    for (const p of inp.procs.filter((x) => x.machine.id === m.id)) {
      const st = inspectionState(inp, p.id, now);
      if (!st) continue;
      version = version ?? st.version;
      if (RANK[st.status] > RANK[status]) status = st.status;
      if (st.dueAt && (!dueAt || st.dueAt < dueAt)) dueAt = st.dueAt;
      if (st.last && (!last || st.last > last)) last = st.last;
    }
    let expected = 0;
    let done = 0;
    let missed = 0;
    for (const r of inp.reqs.filter((x) => x.machine.id === m.id)) {
      const occ = ppeOccurrences({
        cadence: r.cadence,
        settings: inp.settings,
        timeZone: inp.tz,
        startedAt: r.createdAt,
        from,
        to: now,
        checks: checks.filter((c) => c.requirement.id === r.id).map((c) => c.checkedAt),
      });
      for (const o of occ) {
        if (o.status === 'pending') continue;
        expected++;
        if (o.status === 'done') done++;
        else missed++;
      }
    }
    return {
      machineId: m.id,
      machineCode: m.code,
      machineName: m.name,
      procedureVersion: version,
      inspectionStatus: status,
      inspectionDueAt: dueAt ? dueAt.toISOString() : null,
      lastInspectionAt: last,
      ppeExpected: expected,
      ppeDone: done,
      ppeMissed: missed,
      openLockouts: open.filter((s) => s.machine.id === m.id).length,
      retrainingNeeded: training.filter((t) => t.status === 'retrain' && t.machineCode === m.code).length,
      preUseNeeded: preUse.get(m.id)?.needed ?? false,
      preUseMissed: preUse.get(m.id)?.missed ?? false,
      lastPreUseCheckAt: preUse.get(m.id)?.lastAt?.toISOString() ?? null,
    };
  });
  return {
    days,
    machines,
    totals: {
      overdueInspections: machines.filter((m) => m.inspectionStatus === 'overdue').length,
      missedPpeChecks: machines.reduce((s, m) => s + m.ppeMissed, 0),
      openLockouts: machines.reduce((s, m) => s + m.openLockouts, 0),
      retrainingNeeded: training.filter((t) => t.status === 'retrain').length,
      missedPreUseChecks: machines.filter((m) => m.preUseMissed).length,
    },
  };
}

/** Weekly figures for the charts, weeks starting Monday in the shop's time zone. */
export async function timeline(em: EntityManager, who: Principal, weeks: number): Promise<TimelineWeek[]> {
  const inp = await loadInputs(em, who.orgId);
  const now = clock.now();
  const firstWeek = DateTime.fromMillis(clock.ms())
    .setZone(inp.tz)
    .startOf('week')
    .minus({ weeks: weeks - 1 });
  const since = firstWeek.toJSDate();
  const checks = await em.find(PpeCheck, { checkedAt: { $gte: new Date(since.getTime() - 7 * 86_400_000) } });
  // The week label is computed in SQL as text, so no driver time-zone conversion can shift it.
  const counts = await em
    .getConnection()
    .execute<{ week: string; meaning: string; n: string }[]>(
      `select to_char(date_trunc('week', signed_at at time zone ?), 'YYYY-MM-DD') as week, meaning, count(*) as n from safety_sign_off where organization_id = ? and signed_at >= ? group by 1, 2`,
      [inp.tz, who.orgId, since],
    );
  const out: TimelineWeek[] = [];
  for (let i = 0; i < weeks; i++) {
    const start = firstWeek.plus({ weeks: i });
    const end = start.plus({ weeks: 1 });
    const to = new Date(Math.min(end.toJSDate().getTime(), now.getTime()));
    let expected = 0;
    let done = 0;
    for (const r of inp.reqs) {
      const occ = ppeOccurrences({
        cadence: r.cadence,
        settings: inp.settings,
        timeZone: inp.tz,
        startedAt: r.createdAt,
        from: start.toJSDate(),
        to,
        checks: checks.filter((c) => c.requirement.id === r.id).map((c) => c.checkedAt),
      });
      for (const o of occ) {
        if (o.status === 'pending') continue;
        expected++;
        if (o.status === 'done') done++;
      }
    }
    const key = start.toFormat('yyyy-LL-dd');
    const inWeek = counts.filter((c) => c.week === key);
    const states = inp.procs.map((p) => inspectionState(inp, p.id, to)).filter((s): s is NonNullable<typeof s> => s !== null);
    out.push({
      weekStart: key,
      ppeExpected: expected,
      ppeDone: done,
      ppeCompliancePct: expected ? Math.round((done / expected) * 1000) / 10 : null,
      lockouts: inWeek.filter((c) => c.meaning === 'lockout-applied').reduce((s, c) => s + Number(c.n), 0),
      signOffs: inWeek.reduce((s, c) => s + Number(c.n), 0),
      inspectionsCurrentPct: states.length ? Math.round((states.filter((s) => s.status !== 'overdue').length / states.length) * 1000) / 10 : null,
    });
  }
  return out;
}
