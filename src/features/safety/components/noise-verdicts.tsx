import { useMemo, useState } from 'react';
import { Badge, EmptyState } from '../../../components/ui/notice';
import { TextField } from '../../../components/ui/field';
import type { HearingResult, NoiseBasisResult, PpeRequirementRow } from '../../../../shared/schemas/safety-ppe';
import { dailyDoseAcrossTasks } from '../../../../shared/domain/noise';

const round1 = (x: number) => Math.round(x * 10) / 10;
const pct = (x: number) => `${round1(x)} %`;

function BasisLine({ name, r }: { name: string; r: NoiseBasisResult }) {
  const verdict =
    name === 'PEL'
      ? r.reached
        ? `over the ${r.limitDbA} dBA PEL`
        : r.twaDbA !== null && r.twaDbA >= r.limitDbA - 0.05
          ? `at the ${r.limitDbA} dBA PEL, not over it`
          : `under the ${r.limitDbA} dBA PEL`
      : r.reached
        ? `at or over the ${r.limitDbA} dBA action level`
        : `under the ${r.limitDbA} dBA action level`;
  return (
    <li className="flex flex-wrap items-baseline gap-2">
      <Badge tone={r.reached ? (name === 'PEL' ? 'danger' : 'caution') : 'safe'}>{name}</Badge>
      <span>
        Dose {pct(r.dosePercent)}, TWA {r.twaDbA === null ? '—' : round1(r.twaDbA)} dBA: <strong>{verdict}</strong>
        <span className="block text-xs text-steel-600">
          Basis: {r.label} · {r.source}
        </span>
      </span>
    </li>
  );
}

/** The two verdicts of a day's noise (each on its own dose basis), the impact peak and the protected exposure. */
export function NoiseVerdicts({ hearing }: { hearing: HearingResult }) {
  return (
    <div className="space-y-2 text-sm" aria-label="Noise verdicts">
      <ul className="space-y-2">
        <BasisLine name="Action level" r={hearing.actionLevel} />
        <BasisLine name="PEL" r={hearing.pel} />
      </ul>
      {hearing.peak ? (
        <p>
          Impact peak {hearing.peak.peakDbC} dB:{' '}
          <strong>{hearing.peak.exceeded ? `over the ${hearing.peak.limitDb} dB limit` : `under ${hearing.peak.limitDb} dB`}</strong>{' '}
          <span className="text-xs text-steel-600">({hearing.peak.source})</span>
        </p>
      ) : null}
      {hearing.protected ? (
        <p>
          With the issued protector (NRR {hearing.protected.nrr}): about {hearing.protected.twaDbA} dBA ({hearing.protected.source});{' '}
          {hearing.protected.deratedTwaDbA} dBA derated by half ({hearing.protected.deratedSource}).
        </p>
      ) : null}
    </div>
  );
}

/**
 * A person's day across the tasks of several machines: tick the tasks and the hours spent at each;
 * each task's noise periods are scaled to those hours, and the partial doses add up (App. A).
 */
export function PersonDailyDose({ requirements }: { requirements: PpeRequirementRow[] }) {
  const withNoise = requirements.filter((r) => r.noise.length > 0);
  const [hours, setHours] = useState<Record<string, string>>({});
  const result = useMemo(() => {
    const tasks = withNoise
      .map((r) => ({ r, h: Number(hours[r.id] ?? '') }))
      .filter(({ h }) => Number.isFinite(h) && h > 0)
      .map(({ r, h }) => {
        // The task's periods describe a typical day at it; the person's hours there scale them.
        const total = r.noise.reduce((s, n) => s + n.hours, 0);
        const f = total > 0 ? h / total : 0;
        return { label: `${r.machineCode} · ${r.task}`, exposures: r.noise.map((n) => ({ levelDbA: n.levelDbA, hours: n.hours * f })) };
      });
    if (!tasks.length) return null;
    try {
      return { ok: true as const, ...dailyDoseAcrossTasks(tasks) };
    } catch (err) {
      return { ok: false as const, message: err instanceof Error ? err.message : String(err) };
    }
  }, [hours, withNoise]);
  if (!withNoise.length) return <EmptyState title="No task has noise entered yet" />;
  return (
    <div className="grid gap-4 lg:grid-cols-[1fr_22rem]">
      <div className="grid gap-2 md:grid-cols-2">
        {withNoise.map((r) => (
          <TextField
            key={r.id}
            label={`Hours at ${r.machineCode} · ${r.task}`}
            hint={r.noise.map((n) => `${n.levelDbA} dBA × ${n.hours} h`).join(', ') + ' in a typical day'}
            inputMode="decimal"
            value={hours[r.id] ?? ''}
            onChange={(e) => setHours((s) => ({ ...s, [r.id]: e.target.value }))}
          />
        ))}
      </div>
      <aside aria-label="Daily dose of one person" className="space-y-2 rounded border border-steel-300 bg-steel-50 p-3 text-sm">
        <h3 className="font-bold">This person&apos;s day</h3>
        {result === null ? <p className="text-steel-700">Enter the hours at each task.</p> : null}
        {result && !result.ok ? <p role="alert">{result.message}</p> : null}
        {result?.ok ? (
          <>
            <ul className="space-y-1">
              {result.tasks.map((t) => (
                <li key={t.label}>
                  {t.label}: {pct(t.actionLevelDosePercent)} (action-level basis), {pct(t.pelDosePercent)} (PEL basis)
                </li>
              ))}
            </ul>
            <ul className="space-y-2">
              <BasisLine name="Action level" r={result.actionLevel} />
              <BasisLine name="PEL" r={result.pel} />
            </ul>
            <p className="text-xs text-steel-600">Partial doses add up: D = 100 · Σ C/T (OSHA 29 CFR 1910.95 App. A).</p>
          </>
        ) : null}
      </aside>
    </div>
  );
}
