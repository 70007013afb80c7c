import type { ToolSummary } from '../../../../shared/schemas/consumables';
import { Badge } from '../../../components/ui/notice';

const int = new Intl.NumberFormat(undefined, { maximumFractionDigits: 0 });

/** The punch tools at this station, due ones first, with hits since their last sharpening. */
export function ToolsSummary({ tools }: { tools: ToolSummary[] }) {
  const sorted = [...tools].sort((a, b) => Number(b.due) - Number(a.due) || (b.fraction ?? 0) - (a.fraction ?? 0));
  return (
    <ul className="grid gap-2 sm:grid-cols-2" aria-label="Punch tools">
      {sorted.map((t) => (
        <li key={t.id} className={`rounded border-l-8 p-3 ${t.due ? 'border-caution bg-caution-soft' : 'border-steel-300 bg-steel-50'}`}>
          <p className="flex flex-wrap items-center justify-between gap-2">
            <span className="font-bold">{t.code} · {t.name} · station {t.stationSize}</span>
            {t.due ? <Badge tone="caution">Sharpening due</Badge> : null}
          </p>
          <p className="text-sm tabular-nums">{t.hitsSince === null ? 'No hits counted yet' : `${int.format(t.hitsSince)} of ${int.format(t.interval)} hits since sharpening (${Math.round((t.fraction ?? 0) * 100)} %)`}</p>
        </li>
      ))}
    </ul>
  );
}
