import { CartesianGrid, Line, LineChart, ReferenceLine, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';
import { EmptyState, Notice } from '../../../components/ui/notice';
import { useTrend } from '../api/get-trend';
import { formatValue } from './format';
import { shopFormatter } from '../../../lib/format';

const day = shopFormatter({ month: 'short', day: 'numeric' });
const full = shopFormatter({ dateStyle: 'medium', timeStyle: 'short' });
const num = new Intl.NumberFormat(undefined, { maximumFractionDigits: 1 });

/** Readings over time; condition meters show their limits as dashed red lines. */
export function TrendChart({ meterId, days = 365 }: { meterId: string; days?: number }) {
  const q = useTrend(meterId, days);
  if (q.isError) return <Notice tone="danger">{q.error.message}</Notice>;
  if (!q.data)
    return (
      <p role="status" className="text-steel-600">
        Loading chart…
      </p>
    );
  const { meter, points, ratePerDay, rate } = q.data;
  if (points.length === 0) return <EmptyState title={`No readings in the last ${days} days`} />;
  const data = points.map((p) => ({ t: new Date(p.at).getTime(), value: p.value }));
  return (
    <figure className="space-y-2">
      <div
        className="h-72 w-full"
        role="img"
        aria-label={`${meter.name}: ${points.length} readings over the last ${days} days, latest ${formatValue(points[points.length - 1].value, meter.unit)}`}
      >
        <ResponsiveContainer width="100%" height="100%">
          <LineChart data={data} margin={{ top: 8, right: 16, bottom: 8, left: 8 }}>
            <CartesianGrid stroke="#cdd4db" strokeDasharray="3 3" />
            <XAxis dataKey="t" type="number" scale="time" domain={['dataMin', 'dataMax']} tickFormatter={(t) => day.format(new Date(t))} stroke="#38434e" />
            <YAxis
              stroke="#38434e"
              width={84}
              tickFormatter={(v) => num.format(v)}
              label={{ value: meter.unit, angle: -90, position: 'insideLeft', fill: '#38434e' }}
            />
            <Tooltip labelFormatter={(t) => full.format(new Date(Number(t)))} formatter={(v) => [formatValue(Number(v), meter.unit), meter.name]} />
            {meter.upperLimit !== null ? (
              <ReferenceLine
                y={meter.upperLimit}
                stroke="#b91c1c"
                strokeDasharray="6 3"
                label={{ value: `Upper limit ${formatValue(meter.upperLimit, meter.unit)}`, fill: '#7f1212', position: 'insideTopLeft' }}
              />
            ) : null}
            {meter.lowerLimit !== null ? (
              <ReferenceLine
                y={meter.lowerLimit}
                stroke="#b91c1c"
                strokeDasharray="6 3"
                label={{ value: `Lower limit ${formatValue(meter.lowerLimit, meter.unit)}`, fill: '#7f1212', position: 'insideBottomLeft' }}
              />
            ) : null}
            <Line type="monotone" dataKey="value" stroke="#28313a" strokeWidth={2} dot={points.length < 60} isAnimationActive={false} />
          </LineChart>
        </ResponsiveContainer>
      </div>
      <figcaption className="text-sm text-steel-700">
        {points.length} readings over the last {days} days.
        {ratePerDay !== null && rate
          ? ` Usage about ${formatValue(ratePerDay, meter.unit)} per calendar day (least-squares fit on ${rate.readings} readings over ${rate.spanDays} days, the last ${rate.windowDays} days since the last reset; nights and weekends count). Forecasts use this rate.${rate.provisional ? ' Provisional: less than two weeks of readings.' : ''}`
          : ''}
      </figcaption>
    </figure>
  );
}
