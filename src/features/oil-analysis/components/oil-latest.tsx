import { isoViscosityGradeLimits } from '../../../../shared/domain/viscosity';
import type { OilAnalysisRow, OilTarget } from '../../../../shared/schemas/oil-analysis';
import { Notice } from '../../../components/ui/notice';
import { useShopFormat } from '../../../lib/format';

/** Every figure of the latest sample beside its limit, so the technician reads one card, not the table. */
export function OilLatest({ row, target }: { row: OilAnalysisRow; target: OilTarget | null }) {
  const f = useShopFormat();
  const band = target ? isoViscosityGradeLimits(target.vgGrade) : null;
  const flagged = new Set(row.findings.filter((f) => f.severity === 'danger').map((f) => f.field));
  const facts: { key: OilAnalysisRow['findings'][number]['field']; label: string; value: string; limit: string }[] = [
    { key: 'cleanliness', label: 'ISO 4406', value: row.isoCode, limit: target ? `target ${target.targetCode}` : 'no target set' },
    {
      key: 'viscosity',
      label: 'Viscosity at 40 °C',
      value: row.viscosity40 === null ? 'not measured' : `${row.viscosity40} mm²/s`,
      limit: band && target ? `ISO VG ${target.vgGrade}: ${band.min}–${band.max}` : 'no grade set',
    },
    {
      key: 'water',
      label: 'Water',
      value: row.waterPpm === null ? 'not measured' : `${row.waterPpm} ppm`,
      limit: target ? `limit ${target.waterLimitPpm} ppm` : 'no limit set',
    },
    {
      key: 'temperature',
      label: 'Oil temperature',
      value: row.temperatureC === null ? 'not measured' : `${row.temperatureC} °C`,
      limit: target?.temperatureLimitC != null ? `limit ${target.temperatureLimitC} °C` : 'no limit set',
    },
  ];
  return (
    <div className="space-y-3">
      <p className="text-sm text-steel-600">
        Sampled {f.date(row.sampledAt)}
        {row.labReference ? ` · lab reference ${row.labReference}` : ''}
      </p>
      <dl className="grid gap-3 sm:grid-cols-2 lg:grid-cols-4">
        {facts.map((f) => (
          <div key={f.key} className={`rounded border-2 p-3 ${flagged.has(f.key) ? 'border-danger bg-danger-soft' : 'border-steel-200 bg-white'}`}>
            <dt className="text-sm font-semibold text-steel-700">{f.label}</dt>
            <dd className="text-2xl font-bold">{f.value}</dd>
            <dd className="text-sm text-steel-600">
              {flagged.has(f.key) ? <span className="font-semibold text-danger">Outside · </span> : null}
              {f.limit}
            </dd>
          </div>
        ))}
      </dl>
      {row.findings.map((f) => (
        <Notice key={f.message} tone={f.severity}>
          {f.message}
        </Notice>
      ))}
    </div>
  );
}
