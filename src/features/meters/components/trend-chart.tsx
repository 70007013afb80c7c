import { CartesianGrid, Line, LineChart, ReferenceLine, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';
import { EmptyState, Notice } from '../../../components/ui/notice';
import { useTrend } from '../api/get-trend';
import { formatValue } from './format';
import { useShopFormat } from '../../../lib/format';

/** Readings over time; condition meters show their limits as dashed red lines. */
export function TrendChart({ meterId, days = 365 }: { meterId: string; days?: number }) {
  const f = useShopFormat();
  const q = useTrend(meterId, days);
  if (q.isError) return <Notice tone="danger">{q.error.message}</Notice>;
  if (!q.data)
    return (
      <p role="status" className="text-steel-600">
        Loading chart…
      </p>
    );
  const { meter, points, ratePerDay } = q.data;
  if (points.length === 0) return <EmptyState title={`No readings in the last ${days} days`} />;
  const data = points.map((p) => ({ t: new Date(p.at).getTime(), value: p.value }));
  return (
    <figure className="space-y-2">
      <div
        className="h-72 w-full"
        role="img"
        aria-label={`${meter.name}: ${points.length} readings over the last ${days} days, latest ${formatValue(f, points[points.length - 1].value, meter.unit)}`}
      >
        <ResponsiveContainer width="100%" height="100%">
          <LineChart data={data} margin={{ top: 8, right: 16, bottom: 8, left: 8 }}>
            <CartesianGrid stroke="#cdd4db" strokeDasharray="3 3" />
            <XAxis dataKey="t" type="number" scale="time" domain={['dataMin', 'dataMax']} tickFormatter={(t) => f.day(t)} stroke="#38434e" />
            <YAxis
              stroke="#38434e"
              width={84}
              tickFormatter={(v) => f.number(v)}
              label={{ value: meter.unit, angle: -90, position: 'insideLeft', fill: '#38434e' }}
            />
            <Tooltip labelFormatter={(t) => f.dateTime(Number(t))} formatter={(v) => [formatValue(f, Number(v), meter.unit), meter.name]} />
            {meter.upperLimit !== null ? (
              <ReferenceLine
                y={meter.upperLimit}
                stroke="#b91c1c"
                strokeDasharray="6 3"
                label={{ value: `Upper limit ${formatValue(f, meter.upperLimit, meter.unit)}`, fill: '#7f1212', position: 'insideTopLeft' }}
              />
            ) : null}
            {meter.lowerLimit !== null ? (
              <ReferenceLine
                y={meter.lowerLimit}
                stroke="#b91c1c"
                strokeDasharray="6 3"
                label={{ value: `Lower limit ${formatValue(f, meter.lowerLimit, meter.unit)}`, fill: '#7f1212', position: 'insideBottomLeft' }}
              />
            ) : null}
            <Line type="monotone" dataKey="value" stroke="#28313a" strokeWidth={2} dot={points.length < 60} isAnimationActive={false} />
          </LineChart>
        </ResponsiveContainer>
      </div>
      <figcaption className="text-sm text-steel-700">
        {points.length} readings over the last {days} days.
        {ratePerDay !== null ? ` Recent usage about ${formatValue(f, ratePerDay, meter.unit)} per day (least-squares fit since the last reset).` : ''}
      </figcaption>
    </figure>
  );
}
