import { useState } from 'react';
import { useFieldArray, useForm, type Resolver } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { cutCheckSchema, type CutCheckRow, type ReferenceValue } from '../../../../shared/schemas/consumables';
import { Button } from '../../../components/ui/button';
import { Notice, FormMessages } from '../../../components/ui/notice';
import { applyServerErrors } from '../../../lib/form-errors';
import { useRecordCutCheck } from '../api/record-cut-check';

/** While typing, a size may still be empty; the schema refuses it at submit. */
type DimensionDraft = { label: string; nominalMm?: number; measuredMm?: number };
type In = Omit<z.input<typeof cutCheckSchema>, 'dimensions'> & { dimensions: DimensionDraft[] };
type Out = z.output<typeof cutCheckSchema>;
const num = (v: unknown) => (v === '' || v === null || v === undefined ? undefined : Number(v));
const input = 'block min-h-touch w-full rounded border border-steel-400 bg-white px-3';

/** A test coupon measured against nominal; the shop's tolerance decides. */
export function CutCheckForm({ torches, tolerance }: { torches: { id: string; code: string }[]; tolerance: ReferenceValue }) {
  const record = useRecordCutCheck();
  const [result, setResult] = useState<CutCheckRow | null>(null);
  const [formError, setFormError] = useState<string | null>(null);
  const { register, control, handleSubmit, setError, formState } = useForm<In, unknown, Out>({
    // The schema takes any draft and names each empty or wrong size, so it can check drafts.
    resolver: zodResolver(cutCheckSchema) as Resolver<In, unknown, Out>,
    defaultValues: {
      torchId: torches[0]?.id,
      dimensions: [
        { label: 'Length', nominalMm: 100 },
        { label: 'Width', nominalMm: 50 },
        { label: 'Hole Ø', nominalMm: 20 },
      ],
    },
  });
  const dims = useFieldArray({ control, name: 'dimensions' });
  const onSubmit = handleSubmit(async (values) => {
    setFormError(null);
    setResult(null);
    try {
      setResult(await record.mutateAsync(values));
    } catch (err) {
      setFormError(applyServerErrors(err, setError, ['torchId', 'dimensions']));
    }
  });
  const e = formState.errors;
  return (
    <form onSubmit={onSubmit} noValidate aria-label="Record a test coupon" className="space-y-4">
      <p className="text-sm text-steel-700">
        Tolerance ±{tolerance.value} {tolerance.unit} — {tolerance.source}.
      </p>
      <FormMessages error={formError} />
      {result ? (
        <Notice
          tone={result.passed ? 'safe' : 'danger'}
          role="status"
          title={result.passed ? 'Within tolerance' : 'Out of tolerance — consider a consumable change'}
        >
          Largest deviation {result.maxDeviationMm.toFixed(2)} mm against ±{result.toleranceMm} mm. Parts in the torch:{' '}
          {result.installedParts.map((p) => p.partNumber).join(', ') || 'none recorded'}.
          {result.workOrders.length ? ` This coupon did the scheduled work ${result.workOrders.map((w) => `WO ${w.number}`).join(', ')}, now signed off.` : ''}
        </Notice>
      ) : null}
      {torches.length > 1 ? (
        <label className="block space-y-1 text-sm font-semibold">
          Torch
          <select className={input} {...register('torchId')}>
            {torches.map((t) => (
              <option key={t.id} value={t.id}>
                {t.code}
              </option>
            ))}
          </select>
        </label>
      ) : null}
      <table className="w-full text-left text-sm">
        <caption className="sr-only">Coupon dimensions</caption>
        <thead>
          <tr>
            <th scope="col" className="pb-1">
              Dimension
            </th>
            <th scope="col" className="pb-1">
              Nominal (mm)
            </th>
            <th scope="col" className="pb-1">
              Measured (mm)
            </th>
            <th scope="col">
              <span className="sr-only">Remove</span>
            </th>
          </tr>
        </thead>
        <tbody>
          {dims.fields.map((f, i) => (
            <tr key={f.id}>
              <td className="pr-2 pb-2">
                <input aria-label={`Dimension ${i + 1} name`} className={input} {...register(`dimensions.${i}.label`)} />
              </td>
              <td className="pr-2 pb-2">
                <input
                  aria-label={`Dimension ${i + 1} nominal in mm`}
                  inputMode="decimal"
                  className={input}
                  {...register(`dimensions.${i}.nominalMm`, { setValueAs: num })}
                />
              </td>
              <td className="pr-2 pb-2">
                <input
                  aria-label={`Dimension ${i + 1} measured in mm`}
                  inputMode="decimal"
                  className={input}
                  aria-invalid={e.dimensions?.[i]?.measuredMm ? true : undefined}
                  {...register(`dimensions.${i}.measuredMm`, { setValueAs: num })}
                />
                {e.dimensions?.[i]?.measuredMm ? (
                  <p role="alert" className="text-sm font-semibold text-danger">
                    {e.dimensions[i]?.measuredMm?.message}
                  </p>
                ) : null}
              </td>
              <td className="pb-2">
                <Button variant="ghost" onClick={() => dims.remove(i)} aria-label={`Remove dimension ${i + 1}`} disabled={dims.fields.length <= 1}>
                  ✕
                </Button>
              </td>
            </tr>
          ))}
        </tbody>
      </table>
      {e.dimensions?.message ? (
        <p role="alert" className="font-semibold text-danger">
          {e.dimensions.message}
        </p>
      ) : null}
      <div className="flex flex-wrap gap-2">
        <Button variant="secondary" onClick={() => dims.append({ label: '', nominalMm: undefined, measuredMm: undefined })} disabled={dims.fields.length >= 12}>
          Add a dimension
        </Button>
        <Button type="submit" busy={formState.isSubmitting}>
          Record the coupon
        </Button>
      </div>
    </form>
  );
}
