import { useRef, useState } from 'react';
import type { PartOption, ReferenceValue, TorchStation } from '../../../../shared/schemas/consumables';
import { LIFE_UNIT_LABELS, PART_CATEGORY_LABELS } from '../../../../shared/schemas/stock';
import { Button } from '../../../components/ui/button';
import { Notice } from '../../../components/ui/notice';
import { focusSoon, LiveNotice } from '../../../components/ui/live-region';
import { LifeBar } from './life-bar';
import { ChangePoint } from './change-point';
import { ChangeForm } from './change-form';
import { useShopFormat } from '../../../lib/format';

function Counter({ label, value, unit, at }: { label: string; value: number | null; unit: string; at: string | null }) {
  const f = useShopFormat();
  return (
    <div className="rounded border border-steel-300 bg-steel-50 p-3">
      <p className="text-sm font-semibold text-steel-700">{label}</p>
      <p className="text-3xl font-bold tabular-nums">{value === null ? '—' : `${f.number(value)} ${unit}`}</p>
      <p className="text-sm text-steel-700">{at ? `read ${f.dateTime(at)}` : 'no reading yet'}</p>
    </div>
  );
}

export function TorchPanel({ torch, parts, pitLimit, canLog }: { torch: TorchStation; parts: PartOption[]; pitLimit: ReferenceValue; canLog: boolean }) {
  const f = useShopFormat();
  const [open, setOpen] = useState(false);
  const [done, setDone] = useState<string | null>(null);
  const doneRef = useRef<HTMLDivElement>(null);
  const logButton = useRef<HTMLButtonElement>(null);
  return (
    <section aria-labelledby={`torch-${torch.id}`} className="space-y-4 rounded border border-steel-200 bg-white p-4 shadow-sm">
      <header className="flex flex-wrap items-baseline justify-between gap-2">
        <h2 id={`torch-${torch.id}`} className="text-2xl font-bold">
          Torch {torch.code}
        </h2>
        <p className="text-steel-700">{torch.lastChangeAt ? `Last change ${f.dateTime(torch.lastChangeAt)}` : 'No change logged yet'}</p>
      </header>
      {torch.suggestChange && torch.latestCutCheck ? (
        <Notice tone="danger" role="alert" title="Cut quality out of tolerance — consider a consumable change">
          The test coupon of {f.dateTime(torch.latestCutCheck.checkedAt)} was off by up to {torch.latestCutCheck.maxDeviationMm.toFixed(2)} mm (tolerance ±
          {torch.latestCutCheck.toleranceMm} mm) with the parts now in the torch.
        </Notice>
      ) : null}
      <div className="grid gap-3 sm:grid-cols-2">
        {torch.startsMeter ? (
          <Counter
            label="Arc starts"
            value={torch.startsMeter.latest?.value ?? null}
            unit={torch.startsMeter.unit}
            at={torch.startsMeter.latest?.readAt ?? null}
          />
        ) : null}
        {torch.arcHoursMeter ? (
          <Counter
            label="Arc time"
            value={torch.arcHoursMeter.latest?.value ?? null}
            unit={torch.arcHoursMeter.unit}
            at={torch.arcHoursMeter.latest?.readAt ?? null}
          />
        ) : null}
      </div>
      {/* On the page before the message, so the confirmation is announced; focus lands on it once the sheet closes. */}
      <LiveNotice ref={doneRef} message={done ? { tone: 'safe', title: 'Done', text: done } : null} />
      {canLog && !open ? (
        <Button ref={logButton} className="min-h-[4rem] w-full text-xl" onClick={() => (setDone(null), setOpen(true))}>
          Log a change
        </Button>
      ) : null}
      {open ? (
        <ChangeForm
          torch={torch}
          parts={parts}
          pitLimit={pitLimit}
          onCancel={() => {
            setOpen(false);
            focusSoon(() => logButton.current);
          }}
          onDone={(message) => {
            setOpen(false);
            setDone(message);
            focusSoon(() => doneRef.current);
          }}
        />
      ) : null}
      <div>
        <h3 className="mb-2 text-lg font-bold">In the torch now</h3>
        {torch.installed.length === 0 ? <p className="text-steel-700">No parts recorded as installed. Log a change to record what is in the torch.</p> : null}
        <ul className="space-y-3">
          {torch.installed.map((i) => (
            <li key={i.installId} className="rounded border border-steel-200 p-3">
              <p className="flex flex-wrap items-baseline justify-between gap-2">
                <span className="text-lg font-bold">{PART_CATEGORY_LABELS[i.category]}</span>
                <span className="text-sm text-steel-700">
                  {i.partType.partNumber} · in since {f.dateTime(i.installedAt)} · {f.qty(i.partType.onHand, i.partType.stockUnit)} in stock
                </span>
              </p>
              <LifeBar
                label={PART_CATEGORY_LABELS[i.category]}
                used={i.used}
                expected={i.expected}
                unit={i.partType.lifeUnit ? LIFE_UNIT_LABELS[i.partType.lifeUnit] : ''}
                fraction={i.fraction}
              />
              <p className="mt-1 text-sm text-steel-700">
                Since it went in: {i.startsSince === null ? '—' : `${f.number(i.startsSince)} starts`},{' '}
                {i.arcHoursSince === null ? '—' : `${f.number(i.arcHoursSince)} h arc time`}
                {i.expected !== null ? ' · expected life from the part catalogue' : ''}
              </p>
              <ChangePoint plan={i.plan} unit={i.partType.lifeUnit === 'arc-hours' ? 'h' : 'starts'} />
            </li>
          ))}
        </ul>
      </div>
    </section>
  );
}
