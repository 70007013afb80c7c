import { forwardRef, useEffect, useRef, useState, type InputHTMLAttributes } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import {
  REMOVAL_REASON_LABELS,
  consumableChangeSchema,
  type RemovalReason,
  type PartOption,
  type ReferenceValue,
  type TorchStation,
} from '../../../../shared/schemas/consumables';
import { PART_CATEGORY_LABELS, TORCH_CATEGORIES, type TorchCategory } from '../../../../shared/schemas/stock';
import { TORCH_CAUTION } from '../../../../shared/domain/cautions';
import { defaultReasons } from '../../../../shared/domain/consumables';
import { ReasonPicker } from './reason-picker';
import { WorkCaution } from '../../../components/ui/caution';
import { Button } from '../../../components/ui/button';
import { TextField } from '../../../components/ui/field';
import { Notice } from '../../../components/ui/notice';
import { applyServerErrors } from '../../../lib/form-errors';
import { useLogChange } from '../api/log-change';
import { CHANGE_PHOTO_TYPES, PHOTO_MAX_BYTES, megabytes } from '../../../../shared/schemas/photos';
import { useShopFormat } from '../../../lib/format';

type In = z.input<typeof consumableChangeSchema>;
type Out = z.output<typeof consumableChangeSchema>;
const PAIR: TorchCategory[] = ['electrode', 'nozzle'];
const same = (a: readonly string[], b: readonly string[]) => a.length === b.length && a.every((x) => b.includes(x));
const num = (v: unknown) => (v === '' || v === null || v === undefined ? null : Number(v));
const big = 'min-h-[3.5rem] rounded border-2 px-4 py-2 text-lg font-bold text-left';
const on = 'on-dark border-steel-900 bg-steel-900 text-white';
const off = 'border-steel-400 bg-white text-steel-900';

/** A counter that went back to zero (control reset, encoder replaced) may read lower than before. */
export const ResetChoice = forwardRef<HTMLInputElement, InputHTMLAttributes<HTMLInputElement>>(function ResetChoice(props, ref) {
  return (
    <label htmlFor={props.id} className="flex min-h-touch cursor-pointer items-center gap-3 text-sm font-semibold text-steel-800">
      <input ref={ref} type="checkbox" className="h-6 w-6 shrink-0" {...props} />
      The counter was reset or replaced
    </label>
  );
});

/**
 * The change sheet. The common case — electrode and nozzle, the electrode worn and the nozzle
 * changed with it, counters as last read — needs one tap on the pair and one on Record: the
 * reasons and counters come filled in; a different reason for one part is one more tap.
 */
export function ChangeForm({
  torch,
  parts,
  pitLimit,
  onDone,
  onCancel,
}: {
  torch: TorchStation;
  parts: PartOption[];
  pitLimit: ReferenceValue;
  onDone: (message: string) => void;
  onCancel: () => void;
}) {
  const f = useShopFormat();
  const log = useLogChange();
  const heading = useRef<HTMLHeadingElement>(null);
  const [photo, setPhoto] = useState<File | null>(null);
  const [custom, setCustom] = useState(false);
  const [formError, setFormError] = useState<string | null>(null);
  const installedPart = (c: TorchCategory) => torch.installed.find((i) => i.category === c)?.partType.id;
  const { register, handleSubmit, setValue, watch, setError, formState } = useForm<In, unknown, Out>({
    resolver: zodResolver(consumableChangeSchema),
    defaultValues: {
      torchId: torch.id,
      categories: [],
      partTypeIds: {},
      reasons: {},
      startsReading: torch.startsMeter?.latest?.value ?? null,
      arcHoursReading: torch.arcHoursMeter?.latest?.value ?? null,
      pitDepthMm: null,
      startsReset: false,
      arcHoursReset: false,
      takeFromStock: true,
    },
  });
  useEffect(() => heading.current?.focus(), []);
  const categories = (watch('categories') ?? []) as TorchCategory[];
  const [picked, setPicked] = useState<Partial<Record<TorchCategory, RemovalReason>>>({});
  // Defaults for every part chosen, overridden by what the operator tapped.
  const reasons: Partial<Record<TorchCategory, RemovalReason>> = { ...defaultReasons(categories) };
  for (const c of categories) if (picked[c]) reasons[c] = picked[c];
  const reasonsKey = JSON.stringify(reasons);
  useEffect(() => setValue('reasons', JSON.parse(reasonsKey)), [reasonsKey, setValue]);
  const pit = watch('pitDepthMm');
  const choose = (next: TorchCategory[]) => setValue('categories', next, { shouldValidate: formState.isSubmitted });
  const toggle = (c: TorchCategory) =>
    choose(categories.includes(c) ? categories.filter((x) => x !== c) : TORCH_CATEGORIES.filter((x) => x === c || categories.includes(x)));

  const onSubmit = handleSubmit(async (values) => {
    setFormError(null);
    // Parts not chosen explicitly go in as the same part number that comes out.
    const partTypeIds = Object.fromEntries(values.categories.map((c) => [c, values.partTypeIds[c] ?? installedPart(c)]).filter(([, id]) => id));
    try {
      await log.mutateAsync({ ...values, partTypeIds, photo });
      const names = values.categories
        .map((c) => `${PART_CATEGORY_LABELS[c].toLowerCase()} (${values.reasons[c] ? REMOVAL_REASON_LABELS[values.reasons[c]].toLowerCase() : '—'})`)
        .join(' and ');
      onDone(`Change recorded on ${torch.code}: ${names}.${values.takeFromStock ? ' The new parts were taken out of stock.' : ''}`);
    } catch (err) {
      setFormError(
        applyServerErrors(err, setError, [
          'categories',
          ...TORCH_CATEGORIES.map((c) => `reasons.${c}`),
          'startsReading',
          'arcHoursReading',
          'pitDepthMm',
          'note',
          'changedAt',
          ...TORCH_CATEGORIES.map((c) => `partTypeIds.${c}`),
        ]),
      );
    }
  });
  const e = formState.errors;
  const unitOf = (c: TorchCategory) => parts.find((p) => p.id === (watch(`partTypeIds.${c}`) ?? installedPart(c)));

  return (
    <form onSubmit={onSubmit} noValidate aria-labelledby={`change-${torch.id}`} className="space-y-5 rounded border-2 border-steel-800 bg-white p-4">
      <h3 id={`change-${torch.id}`} ref={heading} tabIndex={-1} className="text-xl font-bold">
        Log a change on {torch.code}
      </h3>
      <WorkCaution text={TORCH_CAUTION} />
      {formError ? (
        <Notice tone="danger" role="alert" title="Not recorded">
          {formError}
        </Notice>
      ) : null}

      <fieldset className="space-y-2">
        <legend className="text-base font-bold">Which parts came out?</legend>
        <div className="grid gap-2 sm:grid-cols-3">
          <button
            type="button"
            className={`${big} ${same(categories, PAIR) && !custom ? on : off}`}
            aria-pressed={same(categories, PAIR) && !custom}
            onClick={() => (setCustom(false), choose(PAIR))}
          >
            Electrode + nozzle
          </button>
          <button
            type="button"
            className={`${big} ${same(categories, TORCH_CATEGORIES) && !custom ? on : off}`}
            aria-pressed={same(categories, TORCH_CATEGORIES) && !custom}
            onClick={() => (setCustom(false), choose([...TORCH_CATEGORIES]))}
          >
            Whole set
          </button>
          <button type="button" className={`${big} ${custom ? on : off}`} aria-pressed={custom} onClick={() => setCustom((c) => !c)}>
            Other parts…
          </button>
        </div>
        {custom ? (
          <div className="flex flex-wrap gap-2" role="group" aria-label="Parts">
            {TORCH_CATEGORIES.map((c) => (
              <button
                key={c}
                type="button"
                className={`min-h-touch rounded border-2 px-4 font-semibold ${categories.includes(c) ? on : off}`}
                aria-pressed={categories.includes(c)}
                onClick={() => toggle(c)}
              >
                {categories.includes(c) ? '✓ ' : ''}
                {PART_CATEGORY_LABELS[c]}
              </button>
            ))}
          </div>
        ) : null}
        {e.categories ? (
          <p role="alert" className="font-semibold text-danger">
            {e.categories.message}
          </p>
        ) : null}
      </fieldset>

      {categories.length ? (
        <ReasonPicker
          categories={categories}
          reasons={reasons}
          errors={e.reasons as Partial<Record<TorchCategory, { message?: string }>> | undefined}
          onPick={(c, r) => setPicked((p) => ({ ...p, [c]: r }))}
        />
      ) : null}

      <fieldset className="grid gap-4 sm:grid-cols-2">
        <legend className="mb-2 text-base font-bold">Counters at the change</legend>
        {torch.startsMeter ? (
          <div className="space-y-1">
            <TextField
              label={`Arc starts (${torch.startsMeter.unit})`}
              inputMode="numeric"
              hint={
                watch('startsReset')
                  ? 'Enter what the counter shows now, after the reset'
                  : 'Filled in from the latest reading; change it if the control shows more'
              }
              error={e.startsReading?.message}
              {...register('startsReading', { setValueAs: num })}
            />
            <ResetChoice id={`starts-reset-${torch.id}`} {...register('startsReset')} />
          </div>
        ) : null}
        {torch.arcHoursMeter ? (
          <div className="space-y-1">
            <TextField
              label={`Arc time (${torch.arcHoursMeter.unit})`}
              inputMode="decimal"
              hint={watch('arcHoursReset') ? 'Enter what the counter shows now, after the reset' : 'Filled in from the latest reading'}
              error={e.arcHoursReading?.message}
              {...register('arcHoursReading', { setValueAs: num })}
            />
            <ResetChoice id={`hours-reset-${torch.id}`} {...register('arcHoursReset')} />
          </div>
        ) : null}
        {!torch.startsMeter && !torch.arcHoursMeter ? (
          <p className="text-steel-700">This torch has no arc-start or arc-time meter, so lives cannot be counted.</p>
        ) : null}
      </fieldset>

      <details className="rounded border border-steel-300 p-3">
        <summary className="flex min-h-touch cursor-pointer items-center font-bold">More: pit depth, photo, part numbers, note</summary>
        <div className="mt-3 grid gap-4 sm:grid-cols-2">
          {categories.includes('electrode') ? (
            <div className="space-y-2">
              <TextField
                label="Electrode pit depth (mm, optional)"
                inputMode="decimal"
                hint={`Reference: change at about ${pitLimit.value} mm — ${pitLimit.source}`}
                error={e.pitDepthMm?.message}
                {...register('pitDepthMm', { setValueAs: num })}
              />
              {typeof pit === 'number' && pit >= pitLimit.value ? (
                <Notice tone="caution">The pit is at or past the {pitLimit.value} mm reference: check the nozzle for damage too.</Notice>
              ) : null}
            </div>
          ) : null}
          <label className="flex flex-col gap-1 text-sm font-semibold text-steel-800">
            Photo (optional, image up to {megabytes(PHOTO_MAX_BYTES)} MB)
            <input
              type="file"
              accept={CHANGE_PHOTO_TYPES.join(',')}
              capture="environment"
              className="min-h-touch rounded border border-steel-400 bg-white p-2 font-normal"
              onChange={(ev) => setPhoto(ev.target.files?.[0] ?? null)}
            />
          </label>
          {categories.map((c) => (
            <div key={c} className="space-y-1">
              <label htmlFor={`part-${torch.id}-${c}`} className="block text-sm font-semibold text-steel-800">
                New {PART_CATEGORY_LABELS[c].toLowerCase()}
              </label>
              <select
                id={`part-${torch.id}-${c}`}
                className="block min-h-touch w-full rounded border border-steel-400 bg-white px-3"
                defaultValue={installedPart(c) ?? ''}
                {...register(`partTypeIds.${c}`, { setValueAs: (v) => (v === '' ? undefined : v) })}
              >
                {!installedPart(c) ? <option value="">Choose a part</option> : null}
                {parts
                  .filter((p) => p.category === c)
                  .map((p) => (
                    <option key={p.id} value={p.id}>
                      {p.partNumber} {p.name} — {f.qty(p.onHand, p.stockUnit)} in stock
                    </option>
                  ))}
              </select>
              {e.partTypeIds?.[c] ? (
                <p role="alert" className="text-sm font-semibold text-danger">
                  {e.partTypeIds[c]?.message}
                </p>
              ) : null}
              {unitOf(c) && unitOf(c)!.onHand < 1 ? <p className="text-sm font-semibold text-caution-ink">None in stock</p> : null}
            </div>
          ))}
          <TextField label="Note (optional)" autoComplete="off" error={e.note?.message} {...register('note')} />
          <label className="flex min-h-touch items-center gap-3">
            <input type="checkbox" className="h-6 w-6" {...register('takeFromStock')} />
            Take the new parts out of the shop's stock
          </label>
        </div>
      </details>

      <div className="flex flex-wrap gap-3">
        <Button type="submit" className="min-h-[3.5rem] px-8 text-lg" busy={formState.isSubmitting}>
          Record the change
        </Button>
        <Button variant="secondary" className="min-h-[3.5rem]" onClick={onCancel}>
          Cancel
        </Button>
      </div>
    </form>
  );
}
