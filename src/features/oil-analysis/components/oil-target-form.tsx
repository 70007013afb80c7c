import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { oilTargetInput, type HydraulicUnitView } from '../../../../shared/schemas/oil-analysis';
import { ISO_VG_GRADES, isoViscosityGradeLimits } from '../../../../shared/domain/viscosity';
import { Button } from '../../../components/ui/button';
import { Notice } from '../../../components/ui/notice';
import { SelectField, TextField } from '../../../components/ui/field';
import { applyServerErrors } from '../../../lib/form-errors';
import { useSetOilTarget } from '../api/set-oil-target';

type In = z.input<typeof oilTargetInput>;
type Out = z.output<typeof oilTargetInput>;

/** A unit's targets: ISO 4406 code, ISO VG grade (band from ISO 3448), the oil's new-oil viscosity and the water limit. */
export function OilTargetForm({ unit }: { unit: HydraulicUnitView }) {
  const save = useSetOilTarget();
  const [message, setMessage] = useState<{ tone: 'danger' | 'safe'; text: string } | null>(null);
  const { register, handleSubmit, setError, formState, watch } = useForm<In, unknown, Out>({
    resolver: zodResolver(oilTargetInput),
    defaultValues: unit.target ?? { targetCode: '17/15/12', vgGrade: 46, baselineViscosityCst: null, waterLimitPpm: 500, temperatureLimitC: null },
  });
  const grade = watch('vgGrade');
  let band = '';
  try {
    const l = isoViscosityGradeLimits(Number(grade));
    band = `${l.min}–${l.max} mm²/s at 40 °C (${l.standard})`;
  } catch {
    band = '';
  }
  const onSubmit = handleSubmit(async (v) => {
    setMessage(null);
    try {
      await save.mutateAsync({ machineId: unit.id, input: v });
      setMessage({ tone: 'safe', text: `Targets for ${unit.code} saved.` });
    } catch (err) {
      setMessage({
        tone: 'danger',
        text: applyServerErrors(err, setError, ['targetCode', 'vgGrade', 'baselineViscosityCst', 'waterLimitPpm']) ?? 'Check the marked fields.',
      });
    }
  });
  return (
    <form onSubmit={onSubmit} noValidate aria-label={`Targets for ${unit.code}`} className="grid gap-3 md:grid-cols-4">
      <TextField
        label="Target ISO 4406 code"
        error={formState.errors.targetCode?.message}
        placeholder="17/15/12"
        hint="A dash for a size not judged, e.g. -/15/12"
        {...register('targetCode')}
      />
      <SelectField
        label="ISO VG grade"
        hint={band}
        error={formState.errors.vgGrade?.message}
        options={ISO_VG_GRADES.map((g) => ({ value: String(g), label: `VG ${g}` }))}
        {...register('vgGrade', { setValueAs: (v) => Number(v) })}
      />
      <TextField
        label="Water limit (ppm)"
        inputMode="decimal"
        error={formState.errors.waterLimitPpm?.message}
        {...register('waterLimitPpm', { setValueAs: (v) => Number(v) })}
      />
      <TextField
        label="New-oil viscosity at 40 °C (mm²/s)"
        hint="From the delivered oil's certificate or first sample; used oil is judged against it (empty: the grade's mid-point)"
        inputMode="decimal"
        error={formState.errors.baselineViscosityCst?.message}
        {...register('baselineViscosityCst', { setValueAs: (v) => (v === '' || v === null ? null : Number(v)) })}
      />
      <div className="md:col-span-4">
        <Button type="submit" variant="secondary" busy={formState.isSubmitting}>
          Save targets
        </Button>
      </div>
      {message ? (
        <div className="md:col-span-4">
          <Notice tone={message.tone} role={message.tone === 'danger' ? 'alert' : 'status'}>
            {message.text}
          </Notice>
        </div>
      ) : null}
    </form>
  );
}
