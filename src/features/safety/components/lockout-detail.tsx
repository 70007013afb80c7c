import { useRef, useState, type ReactNode } from 'react';
import { Link } from 'react-router-dom';
import { createColumnHelper } from '@tanstack/react-table';
import { DataTable } from '../../../components/ui/data-table';
import { Button } from '../../../components/ui/button';
import { SelectField, TextField } from '../../../components/ui/field';
import { Notice, Panel } from '../../../components/ui/notice';
import { WorkCaution } from '../../../components/ui/caution';
import { focusSoon, LiveNotice } from '../../../components/ui/live-region';
import { ApiError } from '../../../lib/api-client';
import { paths } from '../../../config/paths';
import { can, type Role } from '../../../../shared/permissions';
import { LOCK_DEVICE_LABELS, type LockoutDetail, type LockPointRow } from '../../../../shared/schemas/safety-lockout';
import { MEANING_LABELS, type SignMeaning } from '../../../../shared/schemas/safety-sign-offs';
import { useProcedure } from '../api/get-procedure';
import { useSafetyPeople } from '../api/get-safety-people';
import { useVerifyLockout } from '../api/verify-lockout';
import { useJoinLockout } from '../api/join-lockout';
import { useLeaveLockout } from '../api/leave-lockout';
import { useOfferHandover } from '../api/offer-handover';
import { useAcceptHandover } from '../api/accept-handover';
import { useReleaseLockout } from '../api/release-lockout';
import { useSignFlow } from './sign-dialog';
import { useLinkedWorkOrder } from '../api/get-linked-work-order';
import { LockoutStateBadge } from './badges';
import { useShopFormat } from '../../../lib/format';
import { AbsentRemovalPanel } from './absent-removal-panel';
import { Check, VerifyChecklist } from './check-row';
import { TestingWindowBanner, TestingWindowPanel } from './testing-window-panel';
import { OutsidePersonnelPanel } from './outside-personnel-panel';
import { DeviceWithReason } from './tag-only-reason';

const pointCol = createColumnHelper<LockPointRow>();
type Me = { id: string; name: string; role: Role };

export function LockoutDetailView({ lockout: l, me }: { lockout: LockoutDetail; me: Me }) {
  const f = useShopFormat();
  const { sign, dialog } = useSignFlow({ name: me.name, role: me.role });
  const [message, setMessage] = useState<{ tone: 'safe' | 'danger'; text: string } | null>(null);
  const messageRef = useRef<HTMLDivElement>(null);
  const procedure = useProcedure(l.procedureId, l.procedureVersion);
  const wo = useLinkedWorkOrder(l.workOrderId);
  const content = procedure.data?.current?.content;
  const people = useSafetyPeople();
  const verify = useVerifyLockout();
  const join = useJoinLockout();
  const leave = useLeaveLockout();
  const offer = useOfferHandover();
  const accept = useAcceptHandover();
  const release = useReleaseLockout();

  const active = l.points.filter((p) => !p.removedAt);
  const isPrimary = l.primaryId === me.id;
  const authorized = can(me.role, 'safety.lockout.sign');
  const myMembership = l.members.find((m) => m.userId === me.id && !m.leftAt);
  const activeMembers = l.members.filter((m) => !m.leftAt);
  const open = l.state !== 'released';

  const [tested, setTested] = useState<string[]>([]);
  const [startTried, setStartTried] = useState(false);
  const [lockNo, setLockNo] = useState('');
  const [handoverTo, setHandoverTo] = useState('');
  const [newLocks, setNewLocks] = useState<Record<string, string>>({});
  const [rel, setRel] = useState({ areaChecked: false, peopleClear: false, affectedNotified: false });
  const [note, setNote] = useState('');

  const done = (text: string) => setMessage({ tone: 'safe', text });
  const failed = (err: unknown) => {
    setMessage({ tone: 'danger', text: err instanceof ApiError ? err.message : 'Could not reach the server. Nothing was signed.' });
    focusSoon(() => messageRef.current);
  };
  const run = (meaning: SignMeaning, fn: (password: string) => Promise<unknown>, text: string, detail?: ReactNode) =>
    sign(
      meaning,
      async (pw) => {
        setMessage(null);
        await fn(pw);
        done(text);
      },
      // The signing control often goes away with its step (verified, released): focus goes to the result.
      { onError: failed, detail, focusAfter: () => messageRef.current },
    );

  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-center gap-3">
        <LockoutStateBadge state={l.state} />
        <span className="text-steel-700">
          Procedure{' '}
          <Link className="font-semibold underline" to={paths.safetyProcedure.getHref(l.procedureId, l.procedureVersion)}>
            version {l.procedureVersion}
          </Link>{' '}
          · held by <strong>{l.primaryName}</strong> · applied {f.dateTime(l.appliedAt)}
          {l.group ? ' · group lockout' : ''}
          {l.workOrderId ? (
            <>
              {' · for '}
              <Link className="font-semibold underline" to={paths.workOrder.getHref(l.workOrderId)}>
                {wo.data ? `WO ${wo.data.number}` : 'its work order'}
              </Link>
            </>
          ) : null}
        </span>
      </div>
      <LiveNotice ref={messageRef} message={message} />
      {open ? (
        l.state === 'testing' || l.state === 'reapplied' ? (
          <TestingWindowBanner lockout={l} />
        ) : l.state === 'verified' ? (
          <Notice tone="danger" title="Locked out: do not operate" role="status">
            Zero energy was verified {f.dateTime(l.verifiedAt)}. Work may go ahead under these locks.
          </Notice>
        ) : (
          <Notice tone="caution" title="Locks on, isolation not yet verified" role="status">
            Nobody starts work until the holder has tried to start the machine and tested every point.
          </Notice>
        )
      ) : (
        <Notice tone="safe" title="Released" role="status">
          All devices were removed {f.dateTime(l.releasedAt)}. The machine may be run again.
        </Notice>
      )}
      {open ? <WorkCaution /> : null}

      <Panel title="Isolation points">
        <DataTable
          caption="Isolation points and devices"
          data={l.points}
          getRowId={(p) => p.id}
          columns={[
            pointCol.accessor('sourceKey', {
              header: 'Point',
              cell: (c) => <span className="inline-flex h-9 min-w-9 items-center justify-center rounded-full bg-caution px-2 font-bold">{c.getValue()}</span>,
            }),
            pointCol.accessor('sourceKind', { header: 'Energy' }),
            pointCol.accessor('isolationDevice', { header: 'Isolation device', cell: (c) => `${c.getValue()} — ${c.row.original.location}` }),
            pointCol.accessor('device', {
              header: 'Device',
              cell: (c) => <DeviceWithReason point={c.row.original} label={LOCK_DEVICE_LABELS[c.getValue() as LockPointRow['device']]} />,
            }),
            pointCol.accessor('lockNumber', {
              header: 'Lock / tag',
              cell: (c) => `${c.getValue()}${c.row.original.tagNumber ? ` / ${c.row.original.tagNumber}` : ''}`,
            }),
            pointCol.accessor('holderName', { header: 'Applied by' }),
            pointCol.accessor('removedAt', {
              header: 'Status',
              cell: (c) => (c.getValue() ? `Removed ${f.dateTime(c.getValue())} by ${c.row.original.removedByName}` : 'On'),
            }),
          ]}
        />
      </Panel>

      <TestingWindowPanel lockout={l} me={me} run={run} content={content} />

      {open && l.state === 'locked' && isPrimary ? (
        <Panel title="Verify isolation (1910.147(d)(6))">
          <div className="space-y-2">
            <VerifyChecklist content={content} points={active} startTried={startTried} onStartTried={setStartTried} tested={tested} onTested={setTested} />
            <Button
              disabled={!startTried || tested.length !== active.length}
              onClick={() =>
                run(
                  'isolation-verified',
                  (password) => verify.mutateAsync({ id: l.id, body: { testedPointIds: tested, readings: [], startAttempted: true, password } }),
                  'Isolation verified and signed. Work may start.',
                )
              }
            >
              Sign: zero energy verified
            </Button>
          </div>
        </Panel>
      ) : null}

      {open ? (
        <Panel title={`Group members (${activeMembers.length} personal lock${activeMembers.length === 1 ? '' : 's'} on)`}>
          {l.members.length ? (
            <ul className="mb-3 space-y-1">
              {l.members.map((m) => (
                <li key={m.id} className="flex flex-wrap gap-2">
                  <strong>{m.name}</strong> lock {m.lockNumber} · on {f.dateTime(m.joinedAt)}
                  {m.leftAt ? ` · off ${f.dateTime(m.leftAt)}` : ' · still on'}
                </li>
              ))}
            </ul>
          ) : (
            <p className="mb-3 text-steel-700">Nobody else has a personal lock on this lockout.</p>
          )}
          {authorized && !isPrimary && !myMembership && l.state !== 'testing' && l.state !== 'reapplied' ? (
            <div className="flex flex-wrap items-end gap-3">
              <TextField label="My personal lock number" value={lockNo} onChange={(e) => setLockNo(e.target.value)} autoComplete="off" />
              <Button
                disabled={!lockNo.trim()}
                onClick={() =>
                  run(
                    'member-joined',
                    (password) => join.mutateAsync({ id: l.id, body: { lockNumber: lockNo.trim(), password } }),
                    `Your lock ${lockNo} is on the group lockout.`,
                  )
                }
              >
                Sign: my lock is on
              </Button>
            </div>
          ) : null}
          {myMembership ? (
            <Button
              variant="secondary"
              onClick={() => run('member-left', (password) => leave.mutateAsync({ id: l.id, body: { password } }), 'Your personal lock is off.')}
            >
              Sign: I removed my lock {myMembership.lockNumber}
            </Button>
          ) : null}
        </Panel>
      ) : null}

      {open && isPrimary && !l.pendingHandoverToId && l.state !== 'testing' && l.state !== 'reapplied' ? (
        <Panel title="Shift hand-over">
          <p className="mb-2 text-steel-700">Your locks stay on until the oncoming authorized employee has put theirs on and accepted (1910.147(f)(4)).</p>
          <div className="flex flex-wrap items-end gap-3">
            <SelectField
              label="Hand over to"
              value={handoverTo}
              onChange={(e) => setHandoverTo(e.target.value)}
              options={[
                { value: '', label: 'Choose the oncoming person' },
                ...(people.data ?? [])
                  .filter((p) => p.id !== me.id && (p.role === 'technician' || p.role === 'safety'))
                  .map((p) => ({ value: p.id, label: p.name })),
              ]}
            />
            <Button
              variant="secondary"
              disabled={!handoverTo}
              onClick={() =>
                run(
                  'handover-offered',
                  (password) => offer.mutateAsync({ id: l.id, body: { toUserId: handoverTo, password } }),
                  'Hand-over offered. Keep your locks on until it is accepted.',
                )
              }
            >
              Sign: offer hand-over
            </Button>
          </div>
        </Panel>
      ) : null}
      {open && l.pendingHandoverToId ? (
        <Panel title="Hand-over waiting">
          {l.pendingHandoverToId === me.id ? (
            <div className="space-y-3">
              <p>{l.primaryName} hands this lockout to you. Put your own lock on each point, then sign; their locks come off in the same record.</p>
              {active
                .filter((p) => p.holderId === l.primaryId)
                .map((p) => (
                  <TextField
                    key={p.id}
                    label={`Your lock on ${p.sourceKey} (replaces ${p.lockNumber})`}
                    value={newLocks[p.id] ?? ''}
                    onChange={(e) => setNewLocks((s) => ({ ...s, [p.id]: e.target.value }))}
                    autoComplete="off"
                  />
                ))}
              <Button
                disabled={active.filter((p) => p.holderId === l.primaryId).some((p) => !newLocks[p.id]?.trim())}
                onClick={() =>
                  run(
                    'handover-accepted',
                    (password) =>
                      accept.mutateAsync({
                        id: l.id,
                        body: { locks: Object.entries(newLocks).map(([pointId, lockNumber]) => ({ pointId, lockNumber: lockNumber.trim() })), password },
                      }),
                    'You hold this lockout now.',
                  )
                }
              >
                Sign: I take over
              </Button>
            </div>
          ) : (
            <p>Waiting for {l.pendingHandoverToName} to put their locks on and accept.</p>
          )}
        </Panel>
      ) : null}

      {open && isPrimary && !l.pendingHandoverToId && l.state !== 'testing' ? (
        <Panel title="Release the lockout (1910.147(e))">
          <div className="space-y-2">
            {content?.release.length ? (
              <ol className="list-decimal pl-6 text-steel-800">
                {content.release.map((s, i) => (
                  <li key={i}>{s}</li>
                ))}
              </ol>
            ) : null}
            {activeMembers.length ? (
              <Notice tone="danger" title="Personal locks still on">
                {activeMembers.map((m) => `${m.name} (${m.lockNumber})`).join(', ')} must remove their own locks first.
              </Notice>
            ) : null}
            <Check
              label="Work area checked: tools removed, guards back, machine intact"
              checked={rel.areaChecked}
              onChange={(v) => setRel((r) => ({ ...r, areaChecked: v }))}
            />
            <Check label="Everyone is clear of the machine" checked={rel.peopleClear} onChange={(v) => setRel((r) => ({ ...r, peopleClear: v }))} />
            <Check
              label="Affected employees told the devices are coming off"
              checked={rel.affectedNotified}
              onChange={(v) => setRel((r) => ({ ...r, affectedNotified: v }))}
            />
            <TextField label="Note (optional)" value={note} onChange={(e) => setNote(e.target.value)} />
            <Button
              variant="primary"
              disabled={!rel.areaChecked || !rel.peopleClear || !rel.affectedNotified || activeMembers.length > 0}
              onClick={() =>
                run(
                  'lockout-released',
                  (password) =>
                    release.mutateAsync({
                      id: l.id,
                      body: { areaChecked: true, peopleClear: true, affectedNotified: true, note: note || undefined, password },
                    }),
                  'Lockout released: your devices are recorded as removed.',
                )
              }
            >
              Sign: release and remove my locks
            </Button>
          </div>
        </Panel>
      ) : null}
      {open && !isPrimary && authorized ? (
        <p className="text-steel-700">Only {l.primaryName}, who holds the locks, can verify, hand over or release this lockout.</p>
      ) : null}

      <Panel title="Signatures on this lockout">
        <ol className="space-y-2">
          {l.signOffs.map((s) => (
            <li key={s.id} className="rounded border-l-4 border-steel-400 bg-steel-50 px-3 py-2">
              <p className="font-semibold">
                #{s.seq} {MEANING_LABELS[s.meaning as SignMeaning] ?? s.meaning} — {s.signerName}, {f.dateTime(s.signedAt)}
              </p>
              <p className="text-sm text-steel-700">“{s.statement}”</p>
            </li>
          ))}
        </ol>
      </Panel>
      <OutsidePersonnelPanel lockout={l} me={me} run={run} />
      <AbsentRemovalPanel lockout={l} me={me} run={run} />
      {dialog}
    </div>
  );
}
