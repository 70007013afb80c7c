import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { Link } from 'react-router-dom';
import { oilAnalysisInput, type HydraulicUnitView, type OilAnalysisRow } from '../../../../shared/schemas/oil-analysis';
import { iso4406Code } from '../../../../shared/domain/cleanliness';
import { Button } from '../../../components/ui/button';
import { Notice } from '../../../components/ui/notice';
import { SelectField, TextField } from '../../../components/ui/field';
import { applyServerErrors } from '../../../lib/form-errors';
import { useRecordOilAnalysis } from '../api/record-oil-analysis';
import { useShopInput } from '../../../lib/shop-time';

type In = z.input<typeof oilAnalysisInput>;
type Out = z.output<typeof oilAnalysisInput>;
const num = (x: unknown) => (x === '' || x === null || x === undefined ? undefined : Number(String(x).replace(',', '.')));
const numOrNull = (x: unknown) => (x === '' || x === null || x === undefined ? null : Number(String(x).replace(',', '.')));

/** Enter a lab (or on-site counter) result; the ISO 4406 code is worked out as you type. */
export function OilAnalysisForm({ units, defaultMachineId }: { units: HydraulicUnitView[]; defaultMachineId?: string }) {
  const input = useShopInput();
  const record = useRecordOilAnalysis();
  const [formError, setFormError] = useState<string | null>(null);
  const [saved, setSaved] = useState<OilAnalysisRow | null>(null);
  const [sampled, setSampled] = useState(() => input.toLocalInput(new Date().toISOString()));
  const { register, handleSubmit, setError, formState, watch, reset } = useForm<In, unknown, Out>({
    resolver: zodResolver(oilAnalysisInput),
    defaultValues: {
      machineId: defaultMachineId ?? units[0]?.id ?? '',
      sampledAt: new Date().toISOString(),
      viscosity40: null,
      waterPpm: null,
      temperatureC: null,
    },
  });
  const [g4, g6, g14] = watch(['ge4um', 'ge6um', 'ge14um']);
  let preview: string | null = null;
  try {
    if ([g4, g6, g14].every((v) => typeof v === 'number' && !Number.isNaN(v)))
      preview = iso4406Code({ ge4um: g4 as number, ge6um: g6 as number, ge14um: g14 as number });
  } catch {
    preview = null;
  }
  const onSubmit = handleSubmit(async (v) => {
    setFormError(null);
    setSaved(null);
    try {
      // Read in the site's zone, whatever the browser's zone.
      const r = await record.mutateAsync({ ...v, sampledAt: input.fromLocalInput(sampled)! });
      setSaved(r);
      reset({ machineId: v.machineId, sampledAt: new Date().toISOString(), viscosity40: null, waterPpm: null, temperatureC: null });
    } catch (err) {
      setFormError(applyServerErrors(err, setError, ['machineId', 'ge4um', 'ge6um', 'ge14um', 'viscosity40', 'waterPpm', 'temperatureC', 'labReference']));
    }
  });
  return (
    <form onSubmit={onSubmit} noValidate aria-label="Record an oil result" className="grid gap-4 md:grid-cols-3">
      {formError ? (
        <div className="md:col-span-3">
          <Notice tone="danger" role="alert">
            {formError}
          </Notice>
        </div>
      ) : null}
      <SelectField
        label="Hydraulic unit"
        error={formState.errors.machineId?.message}
        options={units.map((u) => ({ value: u.id, label: `${u.code} · ${u.name}` }))}
        {...register('machineId')}
      />
      <div className="space-y-1">
        <label htmlFor="oil-sampled" className="block text-sm font-semibold">
          Sampled at (site time)
        </label>
        <input
          id="oil-sampled"
          type="datetime-local"
          className="block w-full min-h-touch rounded border border-steel-400 bg-white px-3 py-2"
          value={sampled}
          onChange={(e) => setSampled(e.target.value)}
        />
      </div>
      <TextField label="Lab reference" error={formState.errors.labReference?.message} {...register('labReference')} />
      <fieldset className="grid gap-3 md:col-span-3 md:grid-cols-4">
        <legend className="font-semibold">Particles per mL (cumulative, µm(c))</legend>
        <TextField label="≥ 4 µm" inputMode="decimal" error={formState.errors.ge4um?.message} {...register('ge4um', { setValueAs: num })} />
        <TextField label="≥ 6 µm" inputMode="decimal" error={formState.errors.ge6um?.message} {...register('ge6um', { setValueAs: num })} />
        <TextField label="≥ 14 µm" inputMode="decimal" error={formState.errors.ge14um?.message} {...register('ge14um', { setValueAs: num })} />
        <div className="self-end rounded bg-steel-100 p-3" aria-live="polite">
          <span className="block text-xs uppercase text-steel-600">ISO 4406 code</span>
          <span className="text-xl font-bold">{preview ?? '—'}</span>
        </div>
      </fieldset>
      <TextField
        label="Viscosity at 40 °C (mm²/s)"
        inputMode="decimal"
        error={formState.errors.viscosity40?.message}
        {...register('viscosity40', { setValueAs: numOrNull })}
      />
      <TextField label="Water (ppm)" inputMode="decimal" error={formState.errors.waterPpm?.message} {...register('waterPpm', { setValueAs: numOrNull })} />
      <TextField
        label="Oil temperature (°C)"
        inputMode="decimal"
        error={formState.errors.temperatureC?.message}
        {...register('temperatureC', { setValueAs: numOrNull })}
      />
      <div className="md:col-span-3">
        <Button type="submit" busy={formState.isSubmitting}>
          Record result
        </Button>
      </div>
      {saved ? (
        <div className="md:col-span-3">
          <Notice
            tone={saved.outOfLimits ? 'danger' : 'safe'}
            title={saved.outOfLimits ? `Outside targets: ${saved.isoCode}` : `Recorded: ${saved.isoCode}`}
            role="status"
          >
            {saved.findings.length ? (
              <ul className="list-disc pl-5">
                {saved.findings.map((f) => (
                  <li key={f.message}>{f.message}</li>
                ))}
              </ul>
            ) : (
              'Within the unit’s targets.'
            )}
            {saved.workOrder ? (
              <p className="mt-1">
                Condition work raised:{' '}
                <Link className="font-semibold underline" to={`/work-orders/${saved.workOrder.id}`}>
                  WO {saved.workOrder.number}
                </Link>
              </p>
            ) : null}
          </Notice>
        </div>
      ) : null}
    </form>
  );
}
