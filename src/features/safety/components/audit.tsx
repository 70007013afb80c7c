import { useState } from 'react';
import { createColumnHelper, type SortingState } from '@tanstack/react-table';
import { Bar, BarChart, CartesianGrid, Legend, Line, LineChart, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';
import { DataTable } from '../../../components/ui/data-table';
import { Button } from '../../../components/ui/button';
import { TextField } from '../../../components/ui/field';
import { Badge, EmptyState, Notice, Panel } from '../../../components/ui/notice';
import { ApiError } from '../../../lib/api-client';
import { ROLE_LABELS, type Role } from '../../../../shared/permissions';
import { MEANING_LABELS, SIGN_MEANINGS, type ListSignOffsQuery, type SignMeaning, type SignOffRow } from '../../../../shared/schemas/safety-sign-offs';
import type { MachineCompliance } from '../../../../shared/schemas/safety-audit';
import { exportHref, useSignOffs } from '../api/get-sign-offs';
import { useChainVerification } from '../api/verify-chain';
import { useCompliance } from '../api/get-compliance';
import { useTimeline } from '../api/get-timeline';
import { useSafetyMachines } from '../api/get-safety-machines';
import { useSafetyPeople } from '../api/get-safety-people';
import { useCorrectSignOff } from '../api/correct-sign-off';
import { useSignFlow } from './sign-dialog';
import { DueBadge } from './badges';
import { fmtDate, fmtDateTime } from './format';

const filterClass = 'min-h-touch rounded border border-steel-400 bg-white px-3 font-normal';
const COLORS = { safe: '#15803d', danger: '#b91c1c', steel: '#38434e', mandatory: '#1d4ed8' };

export function ChainCheck({ timeZone }: { timeZone: string }) {
  const chain = useChainVerification();
  const v = chain.data;
  return (
    <Panel title="Tamper check" actions={<Button onClick={() => chain.refetch()} busy={chain.isFetching}>Verify the chain</Button>}>
      <p className="mb-3 text-steel-700">Recomputes the SHA-256 hash of every signature in order and compares the end with the stored chain head. Any changed, removed or reordered record shows here.</p>
      {chain.isError ? <Notice tone="danger" role="alert">{chain.error.message}</Notice> : null}
      {v ? (
        v.ok ? (
          <Notice tone="safe" title="Chain verified" role="status">
            {v.message} Checked {fmtDateTime(v.verifiedAt, timeZone)}.
          </Notice>
        ) : (
          <Notice tone="danger" title="Chain broken" role="alert">
            {v.message} {v.checked} record{v.checked === 1 ? '' : 's'} before it verified.
            {v.firstBad?.signerName ? ` First bad record: #${v.firstBad.seq}, ${v.firstBad.signerName}, ${fmtDateTime(v.firstBad.signedAt, timeZone)}, ${v.firstBad.meaning ? MEANING_LABELS[v.firstBad.meaning] : ''}.` : ''}
          </Notice>
        )
      ) : null}
    </Panel>
  );
}

const mcol = createColumnHelper<MachineCompliance>();

export function Compliance() {
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
          <dl className="mb-4 grid grid-cols-2 gap-3 md:grid-cols-4">
            {[
              ['Overdue inspections', t.overdueInspections],
              ['Missed PPE checks', t.missedPpeChecks],
              ['Open lockouts', t.openLockouts],
              ['People to retrain', t.retrainingNeeded],
            ].map(([label, n]) => (
              <div key={label} className={`rounded border-l-8 bg-white p-3 ${n ? (label === 'Open lockouts' ? 'border-caution' : 'border-danger') : 'border-safe'}`}>
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
            mcol.accessor('inspectionStatus', { header: 'Periodic inspection', cell: (c) => <DueBadge status={c.getValue() as MachineCompliance['inspectionStatus']} /> }),
            mcol.accessor('inspectionDueAt', { header: 'Inspection due', cell: (c) => fmtDate(c.getValue() as string | null) }),
            mcol.accessor('ppeMissed', {
              header: 'PPE checks',
              cell: (c) => {
                const r = c.row.original;
                if (!r.ppeExpected) return '—';
                return (
                  <span className="flex items-center gap-2">
                    {r.ppeDone}/{r.ppeExpected} done {r.ppeMissed ? <Badge tone="danger">{`${r.ppeMissed} missed`}</Badge> : <Badge tone="safe">None missed</Badge>}
                  </span>
                );
              },
            }),
            mcol.accessor('openLockouts', { header: 'Open lockouts', cell: (c) => ((c.getValue() as number) ? <Badge tone="caution">{`${c.getValue()} open`}</Badge> : '0') }),
            mcol.accessor('retrainingNeeded', { header: 'Retrain', cell: (c) => ((c.getValue() as number) ? <Badge tone="danger">{`${c.getValue()} people`}</Badge> : '0') }),
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
                  <Line type="monotone" dataKey="inspectionsCurrentPct" name="Procedures inspected in time" stroke={COLORS.safe} strokeWidth={3} strokeDasharray="6 3" connectNulls />
                </LineChart>
              </ResponsiveContainer>
            </div>
            <figcaption className="sr-only">
              {(tl.data ?? []).map((w) => `Week of ${w.weekStart}: PPE checks ${w.ppeCompliancePct ?? 'n/a'} %, procedures inspected in time ${w.inspectionsCurrentPct ?? 'n/a'} %.`).join(' ')}
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
            <figcaption className="sr-only">{(tl.data ?? []).map((w) => `Week of ${w.weekStart}: ${w.signOffs} signatures, ${w.lockouts} lockouts.`).join(' ')}</figcaption>
          </figure>
        </Panel>
      </div>
    </div>
  );
}

const col = createColumnHelper<SignOffRow>();

/** Every signature, filtered and sorted on the server, with exports using the same filters. */
export function SignOffAudit({ me, timeZone }: { me: { name: string; role: Role }; timeZone: string }) {
  const [page, setPage] = useState(1);
  const [sorting, setSorting] = useState<SortingState>([{ id: 'signedAt', desc: true }]);
  const [machineId, setMachineId] = useState('');
  const [signerId, setSignerId] = useState('');
  const [meaning, setMeaning] = useState<SignMeaning | ''>('');
  const [from, setFrom] = useState('');
  const [to, setTo] = useState('');
  const [correcting, setCorrecting] = useState<SignOffRow | null>(null);
  const [note, setNote] = useState('');
  const [message, setMessage] = useState<{ tone: 'safe' | 'danger'; text: string } | null>(null);
  const machines = useSafetyMachines();
  const people = useSafetyPeople();
  const correct = useCorrectSignOff();
  const { sign, dialog } = useSignFlow(me);
  const filters = { machineId: machineId || undefined, signerId: signerId || undefined, meaning: meaning || undefined, from: from || undefined, to: to || undefined, sort: (sorting[0]?.id ?? 'signedAt') as ListSignOffsQuery['sort'], dir: (sorting[0]?.desc ? 'desc' : 'asc') as 'asc' | 'desc' };
  const q = useSignOffs({ ...filters, page, pageSize: 25 });
  const reset = (fn: () => void) => () => (fn(), setPage(1));

  return (
    <Panel title="Signatures">
      <div className="mb-3 flex flex-wrap gap-2">
        <a className="flex min-h-touch items-center rounded border border-steel-400 bg-white px-4 font-semibold" href={exportHref('csv', filters)} download>
          Export CSV
        </a>
        <a className="flex min-h-touch items-center rounded border border-steel-400 bg-white px-4 font-semibold" href={exportHref('pdf', filters)} download>
          Export PDF
        </a>
        <span className="self-center text-sm text-steel-700">Exports use the filters below and include the chain check.</span>
      </div>
      {message ? <Notice tone={message.tone} role={message.tone === 'danger' ? 'alert' : 'status'}>{message.text}</Notice> : null}
      {q.isError ? <Notice tone="danger" role="alert">{q.error.message}</Notice> : null}
      <DataTable
        caption="Safety signatures"
        data={q.data?.rows ?? []}
        loading={q.isLoading}
        getRowId={(r) => r.id}
        empty={<EmptyState title="No signatures match these filters" />}
        server={{ total: q.data?.total ?? 0, page, pageSize: 25, sorting, onSortingChange: (s) => (setSorting(s), setPage(1)), onPageChange: setPage }}
        toolbar={
          <>
            <label className="flex flex-col text-sm font-semibold">
              Machine
              <select className={filterClass} value={machineId} onChange={(e) => reset(() => setMachineId(e.target.value))()}>
                <option value="">All machines</option>
                {(machines.data ?? []).map((m) => (
                  <option key={m.id} value={m.id}>
                    {m.code}
                  </option>
                ))}
              </select>
            </label>
            <label className="flex flex-col text-sm font-semibold">
              Person
              <select className={filterClass} value={signerId} onChange={(e) => reset(() => setSignerId(e.target.value))()}>
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
              <select className={filterClass} value={meaning} onChange={(e) => reset(() => setMeaning(e.target.value as SignMeaning | ''))()}>
                <option value="">Any meaning</option>
                {SIGN_MEANINGS.map((m) => (
                  <option key={m} value={m}>
                    {MEANING_LABELS[m]}
                  </option>
                ))}
              </select>
            </label>
            <label className="flex flex-col text-sm font-semibold">
              From
              <input type="date" className={filterClass} value={from} onChange={(e) => reset(() => setFrom(e.target.value))()} />
            </label>
            <label className="flex flex-col text-sm font-semibold">
              To
              <input type="date" className={filterClass} value={to} onChange={(e) => reset(() => setTo(e.target.value))()} />
            </label>
          </>
        }
        columns={[
          col.accessor('seq', { header: '#' }),
          col.accessor('signedAt', { header: 'Signed', cell: (c) => <span className="whitespace-nowrap">{fmtDateTime(c.getValue() as string, timeZone)}</span> }),
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
          col.accessor('summary', { header: 'What was signed', enableSorting: false, cell: (c) => <span className="text-sm">{c.getValue() as string}{c.row.original.note ? <span className="block italic">Note: {c.row.original.note}</span> : null}</span> }),
          col.display({
            id: 'correct',
            header: 'Correction',
            cell: (c) =>
              me.role === 'safety' ? (
                <Button variant="ghost" onClick={() => (setCorrecting(c.row.original), setNote(''))}>
                  Correct
                </Button>
              ) : null,
          }),
        ]}
      />
      {correcting ? (
        <div className="mt-4 space-y-2 rounded border border-caution bg-caution-soft p-3">
          <p className="font-semibold">
            Correct #{correcting.seq} ({correcting.signerName}, {MEANING_LABELS[correcting.meaning]}). The original stays unchanged; the correction is a new signature that points to it.
          </p>
          <TextField label="What was wrong and what is right" value={note} onChange={(e) => setNote(e.target.value)} />
          <div className="flex gap-2">
            <Button variant="secondary" onClick={() => setCorrecting(null)}>
              Cancel
            </Button>
            <Button
              disabled={note.trim().length < 5}
              onClick={() =>
                sign(
                  'correction',
                  async (password) => {
                    const r = await correct.mutateAsync({ id: correcting.id, note: note.trim(), password });
                    setMessage({ tone: 'safe', text: `Correction signed as #${r.seq}.` });
                    setCorrecting(null);
                  },
                  { onError: (err) => setMessage({ tone: 'danger', text: err instanceof ApiError ? err.message : 'Could not sign the correction' }) },
                )
              }
            >
              Sign: correction
            </Button>
          </div>
        </div>
      ) : null}
      {dialog}
    </Panel>
  );
}
