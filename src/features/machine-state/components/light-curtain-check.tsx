import { useState } from 'react';
import { Button } from '../../../components/ui/button';
import { WorkCaution } from '../../../components/ui/caution';
import { EmptyState, FormMessages, Notice } from '../../../components/ui/notice';
import { ApiError } from '../../../lib/api-client';
import { useShopFormat } from '../../../lib/format';
import { useLightCurtainChecks, useRecordLightCurtainCheck } from '../api/light-curtain';

const input = 'mt-1 block min-h-touch w-full rounded border border-steel-400 bg-white px-3 py-2 text-base font-normal';
const FIELDS = [
  { name: 'stoppingTimeMs', label: 'Stopping time of the whole system (ms)', hint: 'Machine stop plus the curtain’s response, as measured' },
  { name: 'detectionCapabilityMm', label: 'Detection capability d (mm)', hint: 'From the curtain’s plate; up to 40 mm' },
  { name: 'measuredDistanceMm', label: 'Measured distance, curtain to danger zone (mm)', hint: 'Measured at the machine' },
] as const;
type FieldName = (typeof FIELDS)[number]['name'];

/**
 * The periodic stopping-time check of a press brake's light curtain: the minimum safety distance
 * is computed on the server (ISO 13855:2010) and compared with the distance measured; a failed
 * check takes the brake out of service.
 */
export function LightCurtainCheck({ code, canRecord }: { code: string; canRecord: boolean }) {
  const f = useShopFormat();
  const checks = useLightCurtainChecks(code);
  const record = useRecordLightCurtainCheck(code);
  const [values, setValues] = useState<Record<FieldName, string>>({ stoppingTimeMs: '', detectionCapabilityMm: '', measuredDistanceMm: '' });
  const [note, setNote] = useState('');
  const [errors, setErrors] = useState<Partial<Record<string, string>>>({});
  const [formError, setFormError] = useState<string | null>(null);
  const submit = async (e: React.FormEvent) => {
    e.preventDefault();
    setErrors({});
    setFormError(null);
    const parsed = Object.fromEntries(FIELDS.map((x) => [x.name, values[x.name].trim() === '' ? Number.NaN : Number(values[x.name].replace(',', '.'))]));
    const missing = FIELDS.filter((x) => !Number.isFinite(parsed[x.name]));
    if (missing.length) return setErrors(Object.fromEntries(missing.map((x) => [x.name, 'Enter a number'])));
    try {
      await record.mutateAsync({ ...(parsed as Record<FieldName, number>), note: note || null });
      setValues({ stoppingTimeMs: '', detectionCapabilityMm: '', measuredDistanceMm: '' });
      setNote('');
    } catch (err) {
      if (err instanceof ApiError && err.fields.length) setErrors(Object.fromEntries(err.fields.map((x) => [x.path, x.message])));
      setFormError(err instanceof Error ? err.message : 'The check was not recorded');
    }
  };
  const latest = checks.data?.[0];
  return (
    <div className="space-y-4">
      {latest ? (
        <Notice tone={latest.pass ? 'safe' : 'danger'} title={latest.pass ? 'Last check passed' : 'Last check failed: the curtain is too close'} role="status">
          {f.dateTime(latest.checkedAt)} by {latest.checkedBy}: needs at least {f.number(latest.requiredDistanceMm)} mm (approach speed{' '}
          {f.number(latest.approachSpeedMmS)} mm/s, stopping time {f.number(latest.stoppingTimeMs)} ms, d = {f.number(latest.detectionCapabilityMm)} mm),
          measured {f.number(latest.measuredDistanceMm)} mm.
          {latest.tookOutOfService ? ' The brake was taken out of service.' : ''}
        </Notice>
      ) : null}
      {canRecord ? (
        <form onSubmit={submit} noValidate aria-label="Record a light-curtain check" className="space-y-3">
          <WorkCaution />
          <div className="grid gap-3 md:grid-cols-3">
            {FIELDS.map((x) => (
              <label key={x.name} className="block text-sm font-semibold" htmlFor={`lc-${x.name}`}>
                {x.label}
                <input
                  id={`lc-${x.name}`}
                  inputMode="decimal"
                  autoComplete="off"
                  className={`${input} ${errors[x.name] ? 'border-danger ring-1 ring-danger' : ''}`}
                  value={values[x.name]}
                  aria-invalid={errors[x.name] ? true : undefined}
                  aria-describedby={`lc-${x.name}-hint`}
                  onChange={(ev) => setValues((v) => ({ ...v, [x.name]: ev.target.value }))}
                />
                <span id={`lc-${x.name}-hint`} className={`mt-1 block font-normal ${errors[x.name] ? 'font-semibold text-danger' : 'text-steel-600'}`}>
                  {errors[x.name] ?? x.hint}
                </span>
              </label>
            ))}
          </div>
          <label className="block text-sm font-semibold" htmlFor="lc-note">
            Note (optional)
            <input id="lc-note" className={input} value={note} onChange={(ev) => setNote(ev.target.value)} />
          </label>
          <FormMessages error={formError} />
          <Button type="submit" busy={record.isPending}>
            Record the check
          </Button>
          <p className="text-sm text-steel-600">
            Minimum distance per ISO 13855:2010 for a curtain detecting hands (d ≤ 40 mm); your site’s procedure and the machine maker’s values take precedence.
            A distance below the minimum takes the brake out of service.
          </p>
        </form>
      ) : null}
      {checks.data && checks.data.length === 0 ? <EmptyState title="No light-curtain check recorded yet" /> : null}
      {checks.data && checks.data.length > 0 ? (
        <table className="w-full text-left text-sm">
          <caption className="sr-only">Light-curtain checks, newest first</caption>
          <thead>
            <tr className="border-b border-steel-300">
              <th scope="col" className="py-2">
                When
              </th>
              <th scope="col">By</th>
              <th scope="col">Needed</th>
              <th scope="col">Measured</th>
              <th scope="col">Result</th>
            </tr>
          </thead>
          <tbody>
            {checks.data.map((c) => (
              <tr key={c.id} className="border-b border-steel-200">
                <td className="py-2">{f.dateTime(c.checkedAt)}</td>
                <td>{c.checkedBy}</td>
                <td>{f.number(c.requiredDistanceMm)} mm</td>
                <td>{f.number(c.measuredDistanceMm)} mm</td>
                <td className={c.pass ? 'font-semibold text-safe-ink' : 'font-semibold text-danger'}>{c.pass ? 'Pass' : 'Fail'}</td>
              </tr>
            ))}
          </tbody>
        </table>
      ) : null}
    </div>
  );
}
