// Over 400 lines: four audit components (filters and table, chain check, compliance, correction dialog) still share this file; a split into one file each is prepared but not merged yet.
import { useMemo, useRef, useState } from 'react';
import { useSearchParams } from 'react-router-dom';
import { createColumnHelper, type SortingState } from '@tanstack/react-table';
import { Bar, BarChart, CartesianGrid, Legend, Line, LineChart, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';
import { DataTable } from '../../../components/ui/data-table';
import { Button } from '../../../components/ui/button';
import { TextField } from '../../../components/ui/field';
import { DateField } from '../../../components/ui/date-field';
import { focusSoon, LiveNotice } from '../../../components/ui/live-region';
import { useModal } from '../../../components/ui/modal';
import { Badge, EmptyState, Notice, Panel } from '../../../components/ui/notice';
import { ApiError } from '../../../lib/api-client';
import { ROLE_LABELS, type Role } from '../../../../shared/permissions';
import {
  MEANING_LABELS,
  reversedRangeMessage,
  SIGN_MEANINGS,
  type ListSignOffsQuery,
  type SignMeaning,
  type SignOffRow,
} from '../../../../shared/schemas/safety-sign-offs';
import type { MachineCompliance } from '../../../../shared/schemas/safety-audit';
import { exportHref, useSignOffs } from '../api/get-sign-offs';
import { useChainVerification } from '../api/verify-chain';
import { useCompliance } from '../api/get-compliance';
import { useTimeline } from '../api/get-timeline';
import { SafetyMachineFilter } from './machine-filter';
import { useSafetyPeople } from '../api/get-safety-people';
import { useCorrectSignOff } from '../api/correct-sign-off';
import { useSignFlow } from './sign-dialog';
import { ChainCopies } from './chain-copies';
import { DueBadge } from './badges';
import { useShopFormat } from '../../../lib/format';

const filterClass = 'min-h-touch rounded border border-steel-400 bg-white px-3 font-normal';
const COLORS = { safe: '#15803d', danger: '#b91c1c', steel: '#38434e', mandatory: '#1d4ed8' };

export function ChainCheck() {
  const f = useShopFormat();
  const chain = useChainVerification();
  const v = chain.data;
  return (
    <Panel
      title="Tamper check"
      actions={
        <Button onClick={() => chain.refetch()} busy={chain.isFetching}>
          Verify the chain
        </Button>
      }
    >
      <p className="mb-3 text-steel-700">
        Recomputes the SHA-256 hash of every signature in order and compares the end with the stored chain head and with the newest copy of the head that left
        the database. Any changed, removed or reordered record shows here.
      </p>
      {chain.isError ? (
        <Notice tone="danger" role="alert">
          {chain.error.message}
        </Notice>
      ) : null}
      {/* On the page before the first check, so each result is announced; focus stays on the button. */}
      <div role="status" aria-live="polite">
        {v ? (
          v.ok ? (
            <Notice tone="safe" title="Chain verified">
              {v.message} Checked {f.dateTime(v.verifiedAt)}.
            </Notice>
          ) : (
            <Notice tone="danger" title="Chain broken">
              {v.message} {v.checked} record{v.checked === 1 ? '' : 's'} before it verified.
              {v.firstBad?.signerName
                ? ` First bad record: #${v.firstBad.seq}, ${v.firstBad.signerName}, ${f.dateTime(v.firstBad.signedAt)}, ${v.firstBad.meaning ? MEANING_LABELS[v.firstBad.meaning] : ''}.`
                : ''}
            </Notice>
          )
        ) : null}
      </div>
      <ChainCopies />
    </Panel>
  );
}

const mcol = createColumnHelper<MachineCompliance>();

export function Compliance() {
  const f = useShopFormat();
  const [days, setDays] = useState(30);
  const q = useCompliance(days);
  const tl = useTimeline(12);
  const t = q.data?.totals;
  return (
    <div className="space-y-4">
      <Panel
        title="Compliance by machine"
        actions={
          <label className="flex items-center gap-2 text-sm font-semibold">
            Window
            <select className={filterClass} value={days} onChange={(e) => setDays(Number(e.target.value))}>
              <option value={7}>7 days</option>
              <option value={30}>30 days</option>
              <option value={90}>90 days</option>
            </select>
          </label>
        }
      >
        {t ? (
          <dl className="mb-4 grid grid-cols-2 gap-3 md:grid-cols-3 lg:grid-cols-5">
            {[
              ['Overdue inspections', t.overdueInspections],
              ['Missed PPE checks', t.missedPpeChecks],
              ['Pre-use checks missing today', t.missedPreUseChecks],
              ['Open lockouts', t.openLockouts],
              ['People to retrain', t.retrainingNeeded],
            ].map(([label, n]) => (
              <div
                key={label}
                className={`rounded border-l-8 bg-white p-3 ${n ? (label === 'Open lockouts' ? 'border-caution' : 'border-danger') : 'border-safe'}`}
              >
                <dt className="text-sm font-semibold text-steel-700">{label}</dt>
                <dd className="text-3xl font-bold">{n}</dd>
              </div>
            ))}
          </dl>
        ) : null}
        {q.isError ? <Notice tone="danger">{q.error.message}</Notice> : null}
        <DataTable
          caption={`Compliance by machine over ${days} days`}
          data={q.data?.machines ?? []}
          loading={q.isLoading}
          getRowId={(r) => r.machineId}
          columns={[
            mcol.accessor('machineCode', { header: 'Machine', cell: (c) => `${c.getValue()} · ${c.row.original.machineName}` }),
            mcol.accessor('procedureVersion', { header: 'Procedure', cell: (c) => (c.getValue() ? `v${c.getValue()}` : <Badge tone="caution">None</Badge>) }),
            mcol.accessor('inspectionStatus', {
              header: 'Periodic inspection',
              cell: (c) => <DueBadge status={c.getValue() as MachineCompliance['inspectionStatus']} />,
            }),
            mcol.accessor('inspectionDueAt', { header: 'Inspection due', cell: (c) => f.date(c.getValue() as string | null) }),
            mcol.accessor('ppeMissed', {
              header: 'PPE checks',
              cell: (c) => {
                const r = c.row.original;
                if (!r.ppeExpected) return '—';
                return (
                  <span className="flex items-center gap-2">
                    {r.ppeDone}/{r.ppeExpected} done{' '}
                    {r.ppeMissed ? <Badge tone="danger">{`${r.ppeMissed} missed`}</Badge> : <Badge tone="safe">None missed</Badge>}
                  </span>
                );
              },
            }),
            // Today only, whatever the window: the check is per shift day, since midnight in the shop's zone.
            mcol.accessor('preUseMissed', {
              header: 'Pre-use today',
              cell: (c) => {
                const r = c.row.original;
                if (!r.preUseNeeded) return '—';
                return r.preUseMissed ? <Badge tone="danger">Missing</Badge> : <Badge tone="safe">{`Done ${f.time(r.lastPreUseCheckAt)}`}</Badge>;
              },
            }),
            mcol.accessor('openLockouts', {
              header: 'Open lockouts',
              cell: (c) => ((c.getValue() as number) ? <Badge tone="caution">{`${c.getValue()} open`}</Badge> : '0'),
            }),
            mcol.accessor('retrainingNeeded', {
              header: 'Retrain',
              cell: (c) => ((c.getValue() as number) ? <Badge tone="danger">{`${c.getValue()} people`}</Badge> : '0'),
            }),
          ]}
        />
      </Panel>
      <div className="grid gap-4 lg:grid-cols-2">
        <Panel title="PPE checks done, % of expected, by week">
          <figure>
            <div className="h-64" role="img" aria-label="Line chart of weekly PPE-check and inspection compliance; the figures are in the caption">
              <ResponsiveContainer width="100%" height="100%">
                <LineChart accessibilityLayer={false} data={tl.data ?? []} margin={{ left: 0, right: 12, top: 8 }}>
                  <CartesianGrid strokeDasharray="3 3" />
                  <XAxis dataKey="weekStart" tickFormatter={(d: string) => d.slice(5)} />
                  <YAxis domain={[0, 100]} unit="%" width={48} />
                  <Tooltip />
                  <Legend />
                  <Line type="monotone" dataKey="ppeCompliancePct" name="PPE checks done" stroke={COLORS.mandatory} strokeWidth={3} connectNulls />
                  <Line
                    type="monotone"
                    dataKey="inspectionsCurrentPct"
                    name="Procedures inspected in time"
                    stroke={COLORS.safe}
                    strokeWidth={3}
                    strokeDasharray="6 3"
                    connectNulls
                  />
                </LineChart>
              </ResponsiveContainer>
            </div>
            <figcaption className="sr-only">
              {(tl.data ?? [])
                .map(
                  (w) =>
                    `Week of ${w.weekStart}: PPE checks ${w.ppeCompliancePct ?? 'n/a'} %, procedures inspected in time ${w.inspectionsCurrentPct ?? 'n/a'} %.`,
                )
                .join(' ')}
            </figcaption>
          </figure>
        </Panel>
        <Panel title="Signatures and lockouts by week">
          <figure>
            <div className="h-64" role="img" aria-label="Bar chart of signatures and lockouts per week; the figures are in the caption">
              <ResponsiveContainer width="100%" height="100%">
                <BarChart accessibilityLayer={false} data={tl.data ?? []} margin={{ left: 0, right: 12, top: 8 }}>
                  <CartesianGrid strokeDasharray="3 3" />
                  <XAxis dataKey="weekStart" tickFormatter={(d: string) => d.slice(5)} />
                  <YAxis allowDecimals={false} width={40} />
                  <Tooltip />
                  <Legend />
                  <Bar dataKey="signOffs" name="Signatures" fill={COLORS.steel} />
                  <Bar dataKey="lockouts" name="Lockouts applied" fill={COLORS.danger} />
                </BarChart>
              </ResponsiveContainer>
            </div>
            <figcaption className="sr-only">
              {(tl.data ?? []).map((w) => `Week of ${w.weekStart}: ${w.signOffs} signatures, ${w.lockouts} lockouts.`).join(' ')}
            </figcaption>
          </figure>
        </Panel>
      </div>
    </div>
  );
}

const col = createColumnHelper<SignOffRow>();

/** The correction form as a modal beside the table, so it opens where the row was clicked, not below the table. */
function CorrectionDialog({
  row,
  me,
  onDone,
  onClose,
}: {
  row: SignOffRow;
  me: { name: string; role: Role };
  onDone: (seq: number) => void;
  onClose: () => void;
}) {
  const ref = useRef<HTMLDialogElement>(null);
  const [note, setNote] = useState('');
  const [error, setError] = useState<string | null>(null);
  const correct = useCorrectSignOff();
  const { sign, dialog } = useSignFlow(me);
  // Open while it is on the page; Escape or Cancel takes focus back to the row's "Add correction".
  useModal(ref, true);
  return (
    <dialog
      ref={ref}
      onCancel={(e) => (e.preventDefault(), onClose())}
      aria-labelledby="correction-title"
      className="m-auto w-[min(36rem,92vw)] rounded border border-steel-300 p-0 shadow-xl backdrop:bg-steel-950/50"
    >
      <div className="space-y-3 p-5">
        <h2 id="correction-title" className="text-xl font-bold">
          Add a correction to #{row.seq}
        </h2>
        <p className="text-steel-700">
          {row.signerName}, {MEANING_LABELS[row.meaning]}: {row.summary}
        </p>
        <p className="text-sm text-steel-700">The original stays unchanged; the correction is a new signature that points to it.</p>
        <TextField label="What was wrong and what is right" hint="At least 5 characters" value={note} onChange={(e) => setNote(e.target.value)} />
        {error ? (
          <Notice tone="danger" role="alert">
            {error}
          </Notice>
        ) : null}
        <div className="flex flex-wrap justify-end gap-2 pt-2">
          <Button variant="secondary" onClick={onClose}>
            Cancel
          </Button>
          <Button
            disabled={note.trim().length < 5}
            onClick={() =>
              sign(
                'correction',
                async (password) => {
                  setError(null);
                  const r = await correct.mutateAsync({ id: row.id, note: note.trim(), password });
                  onDone(r.seq);
                },
                { onError: (err) => setError(err instanceof ApiError ? err.message : 'Could not sign the correction') },
              )
            }
          >
            Sign: correction
          </Button>
        </div>
      </div>
      {dialog}
    </dialog>
  );
}

/** Every signature, filtered and sorted on the server, with exports using the same filters. Filters live in the URL so a view can be shared or reloaded. */
export function SignOffAudit({ me }: { me: { name: string; role: Role } }) {
  const f = useShopFormat();
  const [params, setParams] = useSearchParams();
  const machineId = params.get('machine') ?? '';
  const signerId = params.get('person') ?? '';
  const meaning = (params.get('meaning') ?? '') as SignMeaning | '';
  const from = params.get('from') ?? '';
  const to = params.get('to') ?? '';
  const page = Math.max(1, Number(params.get('page')) || 1);
  const setFilter = (key: 'machine' | 'person' | 'meaning' | 'from' | 'to' | 'page', value: string) =>
    setParams(
      (p) => {
        const next = new URLSearchParams(p);
        if (value) next.set(key, value);
        else next.delete(key);
        if (key !== 'page') next.delete('page');
        return next;
      },
      { replace: true },
    );
  const [sorting, setSorting] = useState<SortingState>([{ id: 'signedAt', desc: true }]);
  const [correcting, setCorrecting] = useState<SignOffRow | null>(null);
  const [message, setMessage] = useState<{ tone: 'safe' | 'danger'; text: string } | null>(null);
  const messageRef = useRef<HTMLDivElement>(null);
  const people = useSafetyPeople();
  const rangeError = from && to && to < from ? reversedRangeMessage(from) : null;
  const filters = {
    machineId: machineId || undefined,
    signerId: signerId || undefined,
    meaning: meaning || undefined,
    from: from || undefined,
    to: to || undefined,
    sort: (sorting[0]?.id ?? 'signedAt') as ListSignOffsQuery['sort'],
    dir: (sorting[0]?.desc ? 'desc' : 'asc') as 'asc' | 'desc',
  };
  const q = useSignOffs({ ...filters, page, pageSize: 25 }, !rangeError);
  // Built once per shop format and role: new cell functions on every render would remount the cells, and the
  // "Add correction" button that opened a dialog would no longer be there to take focus back.
  const columns = useMemo(
    () => [
      col.accessor('seq', { header: '#' }),
      col.accessor('signedAt', {
        header: 'Signed',
        cell: (c) => <span className="whitespace-nowrap">{f.dateTime(c.getValue() as string)}</span>,
      }),
      col.accessor('signerName', { header: 'Printed name', cell: (c) => <span className="font-semibold">{c.getValue() as string}</span> }),
      col.accessor('signerRole', { header: 'Role', enableSorting: false, cell: (c) => ROLE_LABELS[c.getValue() as Role] ?? c.getValue() }),
      col.accessor('meaning', {
        header: 'Meaning',
        cell: (c) => (
          <span>
            {MEANING_LABELS[c.getValue() as SignMeaning]}
            {c.row.original.correctsSeq ? <span className="block text-xs">corrects #{c.row.original.correctsSeq}</span> : null}
            {c.row.original.correctedBy.length ? <Badge tone="caution">{`corrected by #${c.row.original.correctedBy.join(', #')}`}</Badge> : null}
          </span>
        ),
      }),
      col.accessor('machineCode', { id: 'machine', header: 'Machine', cell: (c) => c.getValue() ?? '—' }),
      col.accessor('summary', {
        header: 'What was signed',
        enableSorting: false,
        cell: (c) => (
          <span className="text-sm">
            {c.getValue() as string}
            {c.row.original.note ? <span className="block italic">Note: {c.row.original.note}</span> : null}
          </span>
        ),
      }),
      col.display({
        id: 'correct',
        header: 'Correction',
        cell: (c) =>
          me.role === 'safety' ? (
            <Button
              variant="secondary"
              aria-label={`Add correction to #${c.row.original.seq}`}
              onClick={() => (setMessage(null), setCorrecting(c.row.original))}
            >
              Add correction
            </Button>
          ) : null,
      }),
    ],
    [f, me.role],
  );
  const exportLink = 'flex min-h-touch items-center rounded border border-steel-400 bg-white px-4 font-semibold';

  return (
    <Panel title="Signatures">
      <div className="mb-3 flex flex-wrap gap-2">
        {rangeError ? (
          <>
            <span className={`${exportLink} cursor-not-allowed border-dashed text-steel-700`} aria-disabled="true">
              Export CSV (dates to fix)
            </span>
            <span className={`${exportLink} cursor-not-allowed border-dashed text-steel-700`} aria-disabled="true">
              Export PDF (dates to fix)
            </span>
            <span className="self-center text-sm text-steel-700">Exports use the filters below: fix the dates first.</span>
          </>
        ) : (
          <>
            <a className={exportLink} href={exportHref('csv', filters)} download>
              Export CSV
            </a>
            <a className={exportLink} href={exportHref('pdf', filters)} download>
              Export PDF
            </a>
            <span className="self-center text-sm text-steel-700">Exports use the filters below and include the chain check.</span>
          </>
        )}
      </div>
      <LiveNotice ref={messageRef} message={message} />
      {q.isError ? (
        <Notice tone="danger" role="alert">
          {q.error.message}
        </Notice>
      ) : null}
      <DataTable
        caption="Safety signatures"
        data={rangeError ? [] : (q.data?.rows ?? [])}
        loading={!rangeError && q.isLoading}
        fetching={!rangeError && q.isFetching}
        resultKey={JSON.stringify([machineId, signerId, meaning, from, to, rangeError])}
        countLabel={(n) => (rangeError ? 'Fix the date range to see signatures' : `${n} ${n === 1 ? 'signature matches' : 'signatures match'}`)}
        getRowId={(r) => r.id}
        empty={rangeError ? <EmptyState title="Fix the date range to see signatures" /> : <EmptyState title="No signatures match these filters" />}
        server={{
          total: rangeError ? 0 : (q.data?.total ?? 0),
          page,
          pageSize: 25,
          sorting,
          onSortingChange: (s) => (setSorting(s), setFilter('page', '')),
          onPageChange: (n) => setFilter('page', n > 1 ? String(n) : ''),
        }}
        toolbar={
          // Top-aligned so the error under "To" does not push the other filters out of line.
          <div className="flex flex-wrap items-start gap-3">
            <SafetyMachineFilter value={machineId} onChange={(id) => setFilter('machine', id)} />
            <label className="flex flex-col text-sm font-semibold">
              Person
              <select className={filterClass} value={signerId} onChange={(e) => setFilter('person', e.target.value)}>
                <option value="">Everyone</option>
                {(people.data ?? []).map((p) => (
                  <option key={p.id} value={p.id}>
                    {p.name}
                  </option>
                ))}
              </select>
            </label>
            <label className="flex flex-col text-sm font-semibold">
              Meaning
              <select className={filterClass} value={meaning} onChange={(e) => setFilter('meaning', e.target.value)}>
                <option value="">Any meaning</option>
                {SIGN_MEANINGS.map((m) => (
                  <option key={m} value={m}>
                    {MEANING_LABELS[m]}
                  </option>
                ))}
              </select>
            </label>
            <DateField label="From" value={from} onChange={(v) => setFilter('from', v)} />
            <DateField label="To" value={to} min={from || undefined} error={rangeError} onChange={(v) => setFilter('to', v)} />
          </div>
        }
        columns={columns}
      />
      {correcting ? (
        <CorrectionDialog
          row={correcting}
          me={me}
          onClose={() => setCorrecting(null)}
          onDone={(seq) => {
            setMessage({ tone: 'safe', text: `Correction signed as #${seq}.` });
            setCorrecting(null);
            // The dialog and its signing step are gone: focus goes to the result.
            focusSoon(() => messageRef.current);
          }}
        />
      ) : null}
    </Panel>
  );
}
