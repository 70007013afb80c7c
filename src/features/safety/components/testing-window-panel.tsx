// Devices off to test or position the machine and back on (OSHA 29 CFR 1910.147(f)(1)), on the lockout page.
import { useState, type ReactNode } from 'react';
import { Button } from '../../../components/ui/button';
import { SelectField, TextField } from '../../../components/ui/field';
import { Notice, Panel } from '../../../components/ui/notice';
import { WorkCaution } from '../../../components/ui/caution';
import { can, type Role } from '../../../../shared/permissions';
import type { LockoutDetail } from '../../../../shared/schemas/safety-lockout';
import type { ProcedureContent } from '../../../../shared/schemas/safety-procedures';
import type { SignMeaning } from '../../../../shared/schemas/safety-sign-offs';
import { TEST_WINDOW_PURPOSE_LABELS, TEST_WINDOW_PURPOSES, type TestWindowPurpose, type TestWindowRow } from '../../../../shared/schemas/safety-testing-window';
import { useTestWindows } from '../api/get-test-windows';
import { useOpenTestWindow } from '../api/open-test-window';
import { useReapplyAfterTest } from '../api/reapply-after-test';
import { useReverifyAfterTest } from '../api/reverify-after-test';
import { useShopFormat } from '../../../lib/format';
import { Check, VerifyChecklist } from './check-row';

type Me = { id: string; name: string; role: Role };
type Run = (meaning: SignMeaning, fn: (password: string) => Promise<unknown>, text: string, detail?: ReactNode) => void;

const openWindowOf = (rows: TestWindowRow[] | undefined) => rows?.find((w) => !w.reverifiedAt) ?? null;

/** The state notice while a window is open, in place of the usual lockout notice. */
export function TestingWindowBanner({ lockout: l }: { lockout: LockoutDetail }) {
  const f = useShopFormat();
  const w = openWindowOf(useTestWindows(l.id).data);
  if (l.state === 'testing')
    return (
      <Notice tone="danger" title="Energized for testing — locks off" role="alert">
        {w ? (
          <>
            {TEST_WINDOW_PURPOSE_LABELS[w.purpose]}: {w.reason}. Devices off at {w.removed.map((r) => `${r.sourceKey} (lock ${r.lockNumber})`).join(', ')} since{' '}
            {f.dateTime(w.openedAt)} by {w.openedByName}.{' '}
          </>
        ) : null}
        Stay out of the machine area. No other work until {l.primaryName} puts the devices back on and verifies isolation again.
      </Notice>
    );
  return (
    <Notice tone="caution" title="Locks back on — verify isolation again" role="status">
      The devices went back on {w?.reappliedAt ? f.dateTime(w.reappliedAt) : ''} after testing. Nobody resumes work until {l.primaryName} has tried to start the
      machine and tested every point again.
    </Notice>
  );
}

export function TestingWindowPanel({ lockout: l, me, run, content }: { lockout: LockoutDetail; me: Me; run: Run; content?: ProcedureContent }) {
  const f = useShopFormat();
  const windows = useTestWindows(l.id);
  const openW = useOpenTestWindow();
  const reapply = useReapplyAfterTest();
  const reverify = useReverifyAfterTest();
  const isPrimary = l.primaryId === me.id && can(me.role, 'safety.lockout.sign');
  const active = l.points.filter((p) => !p.removedAt);
  const activeMembers = l.members.filter((m) => !m.leftAt);
  const current = openWindowOf(windows.data);

  const [starting, setStarting] = useState(false);
  const [purpose, setPurpose] = useState<TestWindowPurpose>('testing');
  const [reason, setReason] = useState('');
  const [cleared, setCleared] = useState(false);
  const [peopleOut, setPeopleOut] = useState(false);
  const [membersClear, setMembersClear] = useState(false);
  const [removing, setRemoving] = useState<string[]>([]);
  const [locks, setLocks] = useState<Record<string, string>>({});
  const [deEnergized, setDeEnergized] = useState(false);
  const [startTried, setStartTried] = useState(false);
  const [tested, setTested] = useState<string[]>([]);

  const mine = active.filter((p) => p.holderId === me.id);
  const canOpen = cleared && peopleOut && (activeMembers.length === 0 || membersClear) && removing.length > 0 && reason.trim().length >= 5;

  return (
    <>
      {l.state === 'verified' && isPrimary && !l.pendingHandoverToId ? (
        <Panel title="Test or position (1910.147(f)(1))">
          {!starting ? (
            <div className="flex flex-wrap items-center gap-3">
              <p className="text-steel-700">Take devices off for a short time to test the machine or position it, then put them back and verify again.</p>
              <Button variant="secondary" onClick={() => setStarting(true)}>
                Test or position
              </Button>
            </div>
          ) : (
            <div className="space-y-2">
              <WorkCaution />
              <SelectField
                label="Why the devices come off"
                value={purpose}
                onChange={(e) => setPurpose(e.target.value as TestWindowPurpose)}
                options={TEST_WINDOW_PURPOSES.map((p) => ({ value: p, label: TEST_WINDOW_PURPOSE_LABELS[p] }))}
              />
              <TextField label="What you test or position" value={reason} onChange={(e) => setReason(e.target.value)} maxLength={300} autoComplete="off" />
              <Check label="(i) Machine cleared of tools and materials" checked={cleared} onChange={setCleared} />
              <Check label="(ii) Employees removed from the machine area" checked={peopleOut} onChange={setPeopleOut} />
              {activeMembers.length ? (
                <Check
                  label="Every group member still listed is out of the machine area"
                  hint={activeMembers.map((m) => `${m.name} (${m.lockNumber})`).join(', ')}
                  checked={membersClear}
                  onChange={setMembersClear}
                />
              ) : null}
              <fieldset className="space-y-2">
                <legend className="font-semibold">(iii) Devices that come off</legend>
                {mine.map((p) => (
                  <Check
                    key={p.id}
                    label={`${p.sourceKey} · ${p.sourceKind}: remove lock ${p.lockNumber}`}
                    hint={`${p.isolationDevice} — ${p.location}`}
                    checked={removing.includes(p.id)}
                    onChange={(v) => setRemoving((r) => (v ? [...r, p.id] : r.filter((x) => x !== p.id)))}
                  />
                ))}
              </fieldset>
              <div className="flex flex-wrap gap-3">
                <Button
                  variant="primary"
                  disabled={!canOpen}
                  onClick={() =>
                    run(
                      'testing-window-opened',
                      async (password) => {
                        await openW.mutateAsync({
                          id: l.id,
                          body: {
                            purpose,
                            reason: reason.trim(),
                            machineCleared: true,
                            employeesRemoved: true,
                            membersClear,
                            removePointIds: removing,
                            password,
                          },
                        });
                        // A later window starts from empty boxes: each confirmation is for this window only.
                        setStarting(false);
                        setCleared(false);
                        setPeopleOut(false);
                        setMembersClear(false);
                        setRemoving([]);
                        setReason('');
                      },
                      'Devices off for testing: energize, test or position, then put them back on.',
                    )
                  }
                >
                  Sign: devices off for testing
                </Button>
                <Button variant="secondary" onClick={() => setStarting(false)}>
                  Cancel
                </Button>
              </div>
            </div>
          )}
        </Panel>
      ) : null}

      {l.state === 'testing' && isPrimary && current ? (
        <Panel title="Put the devices back on (1910.147(f)(1)(v))">
          <div className="space-y-2">
            <Check label="Machine stopped and de-energized" checked={deEnergized} onChange={setDeEnergized} />
            {current.removed.map((r) => (
              <TextField
                key={r.pointId}
                label={`Lock back on ${r.sourceKey} (was ${r.lockNumber})`}
                value={locks[r.pointId] ?? ''}
                onChange={(e) => setLocks((s) => ({ ...s, [r.pointId]: e.target.value }))}
                autoComplete="off"
              />
            ))}
            <Button
              variant="primary"
              disabled={!deEnergized || current.removed.some((r) => !locks[r.pointId]?.trim())}
              onClick={() =>
                run(
                  'energy-control-reapplied',
                  async (password) => {
                    await reapply.mutateAsync({
                      id: l.id,
                      body: {
                        locks: current.removed.map((r) => ({ pointId: r.pointId, lockNumber: locks[r.pointId].trim() })),
                        deEnergized: true,
                        password,
                      },
                    });
                    setLocks({});
                    setDeEnergized(false);
                  },
                  'Devices back on. Verify isolation again before work resumes.',
                )
              }
            >
              Sign: devices back on
            </Button>
          </div>
        </Panel>
      ) : null}

      {l.state === 'reapplied' && isPrimary ? (
        <Panel title="Verify isolation again (1910.147(d)(6))">
          <div className="space-y-2">
            <VerifyChecklist content={content} points={active} startTried={startTried} onStartTried={setStartTried} tested={tested} onTested={setTested} />
            <Button
              variant="primary"
              disabled={!startTried || active.some((p) => !tested.includes(p.id))}
              onClick={() =>
                run(
                  'isolation-reverified',
                  async (password) => {
                    await reverify.mutateAsync({
                      id: l.id,
                      body: { testedPointIds: active.map((p) => p.id), readings: [], startAttempted: true, password },
                    });
                    setStartTried(false);
                    setTested([]);
                  },
                  'Isolation verified again and signed. Work may resume.',
                )
              }
            >
              Sign: zero energy verified again
            </Button>
          </div>
        </Panel>
      ) : null}

      {windows.data?.length ? (
        <Panel title="Test and positioning windows">
          <ol className="space-y-2">
            {windows.data.map((w) => (
              <li key={w.id} className="rounded border-l-4 border-caution bg-steel-50 px-3 py-2">
                <p className="font-semibold">
                  {TEST_WINDOW_PURPOSE_LABELS[w.purpose]}: {w.reason}
                </p>
                <p className="text-sm text-steel-700">
                  Devices off {f.dateTime(w.openedAt)} by {w.openedByName} ({w.removed.map((r) => r.sourceKey).join(', ')})
                  {w.membersClear ? ' · group members confirmed clear' : ''} · {w.reappliedAt ? `back on ${f.dateTime(w.reappliedAt)}` : 'still off'} ·{' '}
                  {w.reverifiedAt ? `verified again ${f.dateTime(w.reverifiedAt)}` : 'not verified again yet'}
                </p>
              </li>
            ))}
          </ol>
        </Panel>
      ) : null}
    </>
  );
}
