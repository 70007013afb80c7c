import type { ToolSummary } from '../../../../shared/schemas/consumables';
import { Badge } from '../../../components/ui/notice';
import { useShopFormat } from '../../../lib/format';

/** Past this share of the interval a dull tool is no longer "due" but risks burrs and a broken punch. */
export const SHARPENING_OVERDUE_FRACTION = 1.2;

export type SharpeningState = 'ok' | 'due' | 'overdue';
export const sharpeningState = (t: Pick<ToolSummary, 'due' | 'fraction'>): SharpeningState =>
  t.fraction !== null && t.fraction >= SHARPENING_OVERDUE_FRACTION ? 'overdue' : t.due ? 'due' : 'ok';

const STYLE: Record<SharpeningState, { box: string; badge: React.ReactNode }> = {
  overdue: { box: 'border-danger bg-danger-soft', badge: <Badge tone="danger">Sharpening overdue</Badge> },
  due: { box: 'border-caution bg-caution-soft', badge: <Badge tone="caution">Sharpening due</Badge> },
  ok: { box: 'border-steel-300 bg-steel-50', badge: null },
};
const RANK: Record<SharpeningState, number> = { overdue: 2, due: 1, ok: 0 };

/** The punch tools at this station, most worn first, with hits since their last sharpening. */
export function ToolsSummary({ tools }: { tools: ToolSummary[] }) {
  const f = useShopFormat();
  const sorted = [...tools].sort((a, b) => RANK[sharpeningState(b)] - RANK[sharpeningState(a)] || (b.fraction ?? 0) - (a.fraction ?? 0));
  return (
    <ul className="grid gap-2 sm:grid-cols-2" aria-label="Punch tools">
      {sorted.map((t) => {
        const s = STYLE[sharpeningState(t)];
        return (
          <li key={t.id} className={`rounded border-l-8 p-3 ${s.box}`}>
            <p className="flex flex-wrap items-center justify-between gap-2">
              <span className="font-bold">
                {t.code} · {t.name} · station {t.stationSize}
              </span>
              {s.badge}
            </p>
            <p className="text-sm tabular-nums">
              {t.hitsSince === null
                ? 'No hits counted yet'
                : `${f.number(t.hitsSince, { max: 0 })} of ${f.number(t.interval, { max: 0 })} hits since sharpening (${Math.round((t.fraction ?? 0) * 100)} %)`}
            </p>
          </li>
        );
      })}
    </ul>
  );
}
