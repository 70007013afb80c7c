import { CartesianGrid, Legend, Line, LineChart, ReferenceArea, ReferenceLine, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';
import { parseIso4406Code } from '../../../../shared/domain/cleanliness';
import { isoViscosityGradeLimits } from '../../../../shared/domain/viscosity';
import type { OilAnalysisRow, OilTarget } from '../../../../shared/schemas/oil-analysis';
import { useShopFormat } from '../../../lib/format';

const scale = (code: string, i: 0 | 1 | 2) => {
  try {
    const p = parseIso4406Code(code);
    return [p.ge4um, p.ge6um, p.ge14um][i].scale;
  } catch {
    return null;
  }
};

/** Cleanliness scale numbers and viscosity over time, against the unit's targets. */
export function OilTrendCharts({ rows, target }: { rows: OilAnalysisRow[]; target: OilTarget | null }) {
  const f = useShopFormat();
  const data = [...rows].reverse().map((r) => ({
    at: f.date(r.sampledAt),
    r4: scale(r.isoCode, 0),
    r6: scale(r.isoCode, 1),
    r14: scale(r.isoCode, 2),
    viscosity: r.viscosity40,
    water: r.waterPpm,
  }));
  const t = target ? parseIso4406Code(target.targetCode) : null;
  const band = target ? isoViscosityGradeLimits(target.vgGrade) : null;
  if (data.length < 2) return <p className="text-steel-600">Trends appear after two results.</p>;
  return (
    <div className="grid gap-4 lg:grid-cols-2">
      <figure>
        <figcaption className="font-semibold">ISO 4406 scale numbers (lower is cleaner)</figcaption>
        <div className="h-64">
          <ResponsiveContainer width="100%" height="100%">
            <LineChart data={data} margin={{ top: 8, right: 16, bottom: 8, left: 0 }}>
              <CartesianGrid stroke="#cdd4db" strokeDasharray="3 3" />
              <XAxis dataKey="at" tick={{ fontSize: 12 }} />
              <YAxis domain={[8, 24]} allowDecimals={false} tick={{ fontSize: 12 }} />
              <Tooltip />
              <Legend />
              {/* Straight segments: scale numbers are whole steps between samples, not a smooth curve. */}
              <Line type="linear" dataKey="r4" name="≥4 µm" stroke="#1e2730" strokeWidth={2} dot />
              <Line type="linear" dataKey="r6" name="≥6 µm" stroke="#5d6b78" strokeWidth={2} strokeDasharray="6 3" dot />
              <Line type="linear" dataKey="r14" name="≥14 µm" stroke="#1d4ed8" strokeWidth={2} strokeDasharray="2 2" dot />
              {t?.ge4um.scale ? (
                <ReferenceLine
                  y={t.ge4um.scale}
                  stroke="#b91c1c"
                  strokeDasharray="4 4"
                  label={{ value: `target ${target?.targetCode}`, fontSize: 11, fill: '#7f1212', position: 'insideTopRight' }}
                />
              ) : null}
            </LineChart>
          </ResponsiveContainer>
        </div>
      </figure>
      <figure>
        <figcaption className="font-semibold">Viscosity at 40 °C (mm²/s){band ? ` — ISO VG ${target?.vgGrade} band shaded` : ''}</figcaption>
        <div className="h-64">
          <ResponsiveContainer width="100%" height="100%">
            <LineChart data={data} margin={{ top: 8, right: 16, bottom: 8, left: 0 }}>
              <CartesianGrid stroke="#cdd4db" strokeDasharray="3 3" />
              <XAxis dataKey="at" tick={{ fontSize: 12 }} />
              <YAxis domain={band ? [Math.floor(band.min * 0.85), Math.ceil(band.max * 1.15)] : ['auto', 'auto']} tick={{ fontSize: 12 }} />
              <Tooltip />
              {band ? <ReferenceArea y1={band.min} y2={band.max} fill="#15803d" fillOpacity={0.12} /> : null}
              <Line type="monotone" dataKey="viscosity" name="Viscosity" stroke="#1e2730" strokeWidth={2} dot connectNulls />
            </LineChart>
          </ResponsiveContainer>
        </div>
      </figure>
    </div>
  );
}
