import { lifeState } from '../../../../shared/domain/consumables';
import { useShopFormat } from '../../../lib/format';

const STATE = {
  ok: { bar: 'bg-safe', text: 'Within expected life' },
  near: { bar: 'bg-caution', text: 'Near the end of its expected life' },
  over: { bar: 'bg-danger', text: 'Past its expected life' },
  unknown: { bar: 'bg-steel-400', text: 'No expected life on record' },
} as const;

/** Used life against expected life. Colour follows ISO 3864-1 meanings and the words say the same. */
export function LifeBar({
  label,
  used,
  expected,
  unit,
  fraction,
}: {
  label: string;
  used: number | null;
  expected: number | null;
  unit: string;
  fraction: number | null;
}) {
  const f = useShopFormat();
  const state = lifeState(fraction);
  const s = STATE[state];
  const pct = fraction === null ? 0 : Math.min(100, fraction * 100);
  const words =
    used === null
      ? 'No counter reading since it went in'
      : expected === null
        ? `${f.number(used)} ${unit} so far`
        : `${f.number(used)} of ${f.number(expected)} ${unit} (${Math.round((fraction ?? 0) * 100)} %)`;
  return (
    <div className="space-y-1">
      <div
        role="meter"
        aria-label={`${label} life used`}
        aria-valuemin={0}
        aria-valuemax={expected ?? 100}
        aria-valuenow={used ?? 0}
        aria-valuetext={`${words}. ${s.text}`}
        className="h-5 w-full overflow-hidden rounded border border-steel-400 bg-steel-100"
      >
        <div className={`h-full ${s.bar}`} style={{ width: `${pct}%` }} />
      </div>
      <p className="flex flex-wrap justify-between gap-x-3 text-sm">
        <span className="font-semibold tabular-nums">{words}</span>
        <span className={state === 'over' ? 'font-bold text-danger-ink' : state === 'near' ? 'font-bold text-caution-ink' : 'text-steel-700'}>{s.text}</span>
      </p>
    </div>
  );
}
