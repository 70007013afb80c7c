// Over 400 lines after formatting: one form whose trigger, checklist and parts sections share one react-hook-form control; splitting the sections into files is the next step.
import { useEffect, useMemo, useRef, useState } from 'react';
import { Controller, useFieldArray, useForm, useWatch, type Control, type UseFormRegister, type FieldErrors } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { Link } from 'react-router-dom';
import type { z } from 'zod';
import { planInput, TRIGGER_KINDS, TRIGGER_KIND_LABELS, type PlanDetail, type PlanLookups, type TriggerInput } from '../../../../shared/schemas/plans';
import { ROLES, ROLE_LABELS } from '../../../../shared/permissions';
import { buildRecurrenceText, expandRecurrence } from '../../../../shared/domain/recurrence';
import { Button } from '../../../components/ui/button';
import { Notice, FormMessages } from '../../../components/ui/notice';
import { SelectField, TextField } from '../../../components/ui/field';
import { applyServerErrors } from '../../../lib/form-errors';
import { inputClass } from './format';
import { todayIn } from '../../../../shared/locale';
import { useShopFormat } from '../../../lib/format';
import { StationRecordField } from './station-record-field';

type In = z.input<typeof planInput>;
type Out = z.output<typeof planInput>;

const num = (x: unknown) => (x === '' || x === null || x === undefined ? undefined : Number(String(x).replace(',', '.')));
const RULE_PRESETS = [
  { label: 'Every Monday', rrule: 'FREQ=WEEKLY;BYDAY=MO' },
  { label: 'Mon, Wed, Fri', rrule: 'FREQ=WEEKLY;BYDAY=MO,WE,FR' },
  { label: 'Every day', rrule: 'FREQ=DAILY' },
  { label: 'First Monday of the month', rrule: 'FREQ=MONTHLY;BYDAY=1MO' },
  { label: 'Every 3 months on the 1st', rrule: 'FREQ=MONTHLY;INTERVAL=3;BYMONTHDAY=1' },
];

const blank = (kind: TriggerInput['kind'], timeZone: string): TriggerInput => {
  switch (kind) {
    case 'calendar-fixed':
      return { kind, start: `${todayIn(timeZone)}T07:00`, rrule: 'FREQ=WEEKLY;BYDAY=MO' };
    case 'calendar-floating':
      return { kind, every: 1, unit: 'month' };
    case 'meter':
      return { kind, meterId: '', every: 500 };
    case 'condition':
      return { kind, meterId: '', above: undefined, below: undefined };
    case 'oil-analysis':
      return { kind };
  }
};

/** The plan as the form edits it (a stored fixed calendar keeps its local start and rule). */
export function toFormValues(p: PlanDetail): In {
  return {
    machineId: p.machine.id,
    title: p.title,
    instructions: p.instructions,
    checklist: p.checklist,
    estimatedMinutes: p.estimatedMinutes,
    parts: p.parts.map((x) => ({ partTypeId: x.partTypeId, quantity: x.quantity })),
    responsibleRole: p.responsibleRole,
    responsibleUserId: p.responsibleUser?.id ?? null,
    requiresLockout: p.requiresLockout,
    safetyCritical: p.safetyCritical,
    dueSoonDays: p.dueSoonDays,
    dueSoonFraction: p.dueSoonFraction,
    active: p.active,
    stationRecord: p.stationRecord ? (({ summary: _summary, ...rule }) => rule)(p.stationRecord) : null,
    triggers: p.triggers.map((t): TriggerInput => {
      switch (t.kind) {
        case 'calendar-fixed':
          return { kind: t.kind, start: t.start.slice(0, 16), rrule: t.rrule };
        case 'calendar-floating':
          return { kind: t.kind, every: t.every, unit: t.unit };
        case 'meter':
          return { kind: t.kind, meterId: t.meterId, every: t.every };
        case 'condition':
          return { kind: t.kind, meterId: t.meterId, above: t.above, below: t.below };
        case 'oil-analysis':
          return { kind: t.kind };
      }
    }),
  };
}

/** Next few occurrences of a fixed calendar trigger, computed in the browser with the same domain code as the server. */
function RulePreview({ start, rrule, timeZone }: { start: string; rrule: string; timeZone: string }) {
  const f = useShopFormat();
  const preview = useMemo(() => {
    try {
      const ical = buildRecurrenceText({ start, tzid: timeZone, rrule });
      const next = expandRecurrence(ical, { after: new Date(), limit: 3 });
      return { ok: true as const, text: next.length ? next.map((d) => f.dateTime(d, { weekday: true })).join(' · ') : 'No more occurrences' };
    } catch (err) {
      return { ok: false as const, text: (err instanceof Error ? err.message : String(err)).replace(/^recurrence: /, '') };
    }
  }, [start, rrule, timeZone, f]);
  return (
    <p className={`text-sm ${preview.ok ? 'text-steel-700' : 'font-semibold text-danger'}`} aria-live="polite">
      {preview.ok ? `Next: ${preview.text}` : `Check the rule: ${preview.text}`}
    </p>
  );
}

function TriggerFields({
  index,
  control,
  register,
  errors,
  meters,
  timeZone,
  onKind,
}: {
  index: number;
  control: Control<In, unknown, Out>;
  register: UseFormRegister<In>;
  errors: FieldErrors<In>;
  meters: PlanLookups['meters'];
  timeZone: string;
  onKind: (k: TriggerInput['kind']) => void;
}) {
  const t = useWatch({ control, name: `triggers.${index}` }) as TriggerInput;
  const err = (errors.triggers?.[index] ?? {}) as Record<string, { message?: string } | undefined>;
  const id = (f: string) => `trigger-${index}-${f}`;
  const counters = meters.filter((m) => m.kind !== 'condition');
  const conditions = meters.filter((m) => m.kind === 'condition');
  return (
    <div className="grid gap-3 md:grid-cols-2">
      <div className="md:col-span-2">
        <label htmlFor={id('kind')} className="block text-sm font-semibold">
          Kind of trigger
        </label>
        <select id={id('kind')} className={inputClass} value={t?.kind} onChange={(e) => onKind(e.target.value as TriggerInput['kind'])}>
          {TRIGGER_KINDS.map((k) => (
            <option key={k} value={k}>
              {TRIGGER_KIND_LABELS[k]}
            </option>
          ))}
        </select>
      </div>
      {t?.kind === 'calendar-fixed' ? (
        <>
          <TextField
            id={id('start')}
            label={`First time (local, ${timeZone})`}
            type="datetime-local"
            error={err.start?.message}
            {...register(`triggers.${index}.start` as const)}
          />
          <TextField
            id={id('rrule')}
            label="Repeat rule (RFC 5545 RRULE)"
            error={err.rrule?.message}
            hint="e.g. FREQ=WEEKLY;BYDAY=MO"
            {...register(`triggers.${index}.rrule` as const)}
          />
          <Controller
            control={control}
            name={`triggers.${index}.rrule` as const}
            render={({ field }) => (
              <div className="flex flex-wrap gap-2 md:col-span-2" role="group" aria-label="Common rules">
                {RULE_PRESETS.map((p) => (
                  <Button key={p.rrule} variant="secondary" className="text-sm" aria-pressed={field.value === p.rrule} onClick={() => field.onChange(p.rrule)}>
                    {p.label}
                  </Button>
                ))}
              </div>
            )}
          />
          <div className="md:col-span-2">
            <RulePreview start={t.start} rrule={t.rrule} timeZone={timeZone} />
          </div>
        </>
      ) : null}
      {t?.kind === 'calendar-floating' ? (
        <>
          <TextField
            id={id('every')}
            label="Every"
            inputMode="numeric"
            error={err.every?.message}
            {...register(`triggers.${index}.every` as const, { setValueAs: num })}
          />
          <SelectField
            id={id('unit')}
            label="Unit (counted from when it was last done)"
            options={[
              { value: 'day', label: 'days' },
              { value: 'week', label: 'weeks' },
              { value: 'month', label: 'months' },
            ]}
            {...register(`triggers.${index}.unit` as const)}
          />
        </>
      ) : null}
      {t?.kind === 'meter' ? (
        <>
          <SelectField
            id={id('meterId')}
            label="Meter"
            error={err.meterId?.message}
            options={[
              { value: '', label: counters.length ? 'Choose a meter…' : 'This machine has no counters' },
              ...counters.map((m) => ({ value: m.id, label: `${m.name} (${m.unit})` })),
            ]}
            {...register(`triggers.${index}.meterId` as const)}
          />
          <TextField
            id={id('every')}
            label={`Every (${counters.find((m) => m.id === t.meterId)?.unit ?? 'units'}) since last done`}
            inputMode="decimal"
            error={err.every?.message}
            {...register(`triggers.${index}.every` as const, { setValueAs: num })}
          />
        </>
      ) : null}
      {t?.kind === 'condition' ? (
        <>
          <SelectField
            id={id('meterId')}
            label="Condition reading"
            error={err.meterId?.message}
            options={[
              { value: '', label: conditions.length ? 'Choose a reading…' : 'This machine has no condition readings' },
              ...conditions.map((m) => ({ value: m.id, label: `${m.name} (${m.unit})` })),
            ]}
            {...register(`triggers.${index}.meterId` as const)}
          />
          <div className="grid grid-cols-2 gap-2">
            <TextField
              id={id('above')}
              label="Due when above"
              inputMode="decimal"
              error={err.above?.message}
              {...register(`triggers.${index}.above` as const, { setValueAs: num })}
            />
            <TextField
              id={id('below')}
              label="Due when below"
              inputMode="decimal"
              error={err.below?.message}
              {...register(`triggers.${index}.below` as const, { setValueAs: num })}
            />
          </div>
        </>
      ) : null}
      {t?.kind === 'oil-analysis' ? (
        <p className="text-sm text-steel-700 md:col-span-2">
          Falls due when an oil result for this unit is outside its cleanliness, viscosity, water or temperature targets.
        </p>
      ) : null}
      {err.kind?.message ? (
        <p className="text-sm font-semibold text-danger md:col-span-2" role="alert">
          {err.kind.message}
        </p>
      ) : null}
    </div>
  );
}

/** Write or change a maintenance plan: what to do, the checklist, parts, who, and when (whichever trigger comes first). */
export function PlanForm({
  lookups,
  initial,
  submitLabel,
  cancelHref,
  onSubmit,
}: {
  lookups: PlanLookups;
  initial?: In;
  submitLabel: string;
  cancelHref: string;
  onSubmit: (v: Out) => Promise<void>;
}) {
  const [formError, setFormError] = useState<string | null>(null);
  const { register, handleSubmit, control, setError, formState, getValues, setValue } = useForm<In, unknown, Out>({
    resolver: zodResolver(planInput),
    defaultValues: initial ?? {
      machineId: '',
      title: '',
      instructions: '',
      checklist: [],
      estimatedMinutes: null,
      parts: [],
      responsibleRole: 'technician',
      responsibleUserId: null,
      requiresLockout: false,
      safetyCritical: false,
      dueSoonDays: 3,
      dueSoonFraction: 0.1,
      active: true,
      stationRecord: null,
      triggers: [blank('calendar-floating', lookups.timeZone)],
    },
  });
  const triggers = useFieldArray({ control, name: 'triggers' });
  const checklist = useFieldArray({ control, name: 'checklist' });
  const parts = useFieldArray({ control, name: 'parts' });
  const machineId = useWatch({ control, name: 'machineId' });
  const lines = useWatch({ control, name: 'checklist' });
  const related = useMemo(() => {
    const m = lookups.machines.find((x) => x.id === machineId);
    if (!m) return new Set<string>();
    return new Set([m.id, ...(m.parentId ? [m.parentId] : []), ...lookups.machines.filter((x) => x.parentId === m.id).map((x) => x.id)]);
  }, [machineId, lookups.machines]);
  const meters = lookups.meters.filter((m) => related.has(m.machineId));
  const errs = formState.errors;
  // A meter picked for the machine chosen before belongs to that machine: clear it when the machine
  // changes, so the form asks for one of this machine's meters instead of the server refusing it.
  const shownMachine = useRef(machineId);
  useEffect(() => {
    if (shownMachine.current === machineId) return;
    shownMachine.current = machineId;
    const own = new Set(lookups.meters.filter((m) => related.has(m.machineId)).map((m) => m.id));
    (getValues('triggers') ?? []).forEach((t, i) => {
      if ('meterId' in t && t.meterId && !own.has(t.meterId)) setValue(`triggers.${i}.meterId` as const, '', { shouldDirty: true });
    });
  }, [machineId, related, lookups.meters, getValues, setValue]);

  const submit = handleSubmit(async (v) => {
    setFormError(null);
    try {
      await onSubmit(v);
    } catch (err) {
      const vals = getValues();
      const paths = [
        'machineId',
        'title',
        'instructions',
        'estimatedMinutes',
        'responsibleRole',
        'responsibleUserId',
        'dueSoonDays',
        'dueSoonFraction',
        'checklist',
        'triggers',
        'stationRecord.kind',
        'stationRecord.categories',
        'stationRecord.meterId',
        ...(vals.triggers ?? []).flatMap((_, i) => ['start', 'rrule', 'every', 'unit', 'meterId', 'above', 'below', 'kind'].map((f) => `triggers.${i}.${f}`)),
        ...(vals.checklist ?? []).flatMap((_, i) => ['label', 'unit', 'min', 'max'].map((f) => `checklist.${i}.${f}`)),
        ...(vals.parts ?? []).flatMap((_, i) => [`parts.${i}.partTypeId`, `parts.${i}.quantity`]),
      ];
      setFormError(applyServerErrors(err, setError, paths) ?? 'Some fields need another look (marked below).');
    }
  });

  return (
    <form onSubmit={submit} noValidate aria-label="Maintenance plan" className="space-y-6">
      <FormMessages error={formError} />
      {Object.keys(errs).length && !formError ? (
        <Notice tone="danger" role="alert">
          Some fields need another look (marked below).
        </Notice>
      ) : null}
      <section className="grid gap-4 md:grid-cols-2" aria-labelledby="plan-what">
        <h2 id="plan-what" className="text-lg font-bold md:col-span-2">
          What and where
        </h2>
        <SelectField
          label="Machine or component"
          error={errs.machineId?.message}
          options={[
            { value: '', label: 'Choose…' },
            ...lookups.machines.map((m) => ({ value: m.id, label: `${m.parentId ? '— ' : ''}${m.code} · ${m.name}` })),
          ]}
          {...register('machineId')}
        />
        <TextField label="Title" error={errs.title?.message} placeholder="e.g. Replace return filter element" {...register('title')} />
        <div className="space-y-1 md:col-span-2">
          <label htmlFor="plan-instructions" className="block text-sm font-semibold">
            Instructions
          </label>
          <textarea id="plan-instructions" rows={4} className={inputClass} {...register('instructions')} />
        </div>
        <TextField
          label="Planned time (minutes)"
          inputMode="numeric"
          error={errs.estimatedMinutes?.message}
          {...register('estimatedMinutes', { setValueAs: (x) => (x === '' || x === null ? null : Number(x)) })}
        />
        <fieldset className="space-y-1">
          <legend className="text-sm font-semibold">Safety</legend>
          <label className="flex min-h-touch items-center gap-3">
            <input type="checkbox" className="h-6 w-6" {...register('requiresLockout')} /> Needs lockout/tagout (sign-off waits for its release)
          </label>
          <label className="flex min-h-touch items-center gap-3">
            <input type="checkbox" className="h-6 w-6" {...register('safetyCritical')} /> Safety work (past due: safety officer told, notices always sent)
          </label>
        </fieldset>
        <StationRecordField
          control={control}
          meters={meters}
          errors={{
            kind: (errs.stationRecord as { kind?: { message?: string } } | undefined)?.kind?.message ?? errs.stationRecord?.message,
            categories: (errs.stationRecord as { categories?: { message?: string } } | undefined)?.categories?.message,
            meterId: (errs.stationRecord as { meterId?: { message?: string } } | undefined)?.meterId?.message,
          }}
        />
      </section>

      <section className="space-y-3" aria-labelledby="plan-when">
        <h2 id="plan-when" className="text-lg font-bold">
          When — whichever trigger comes first
        </h2>
        {errs.triggers?.message || errs.triggers?.root?.message ? (
          <p className="text-sm font-semibold text-danger" role="alert">
            {errs.triggers?.message ?? errs.triggers?.root?.message}
          </p>
        ) : null}
        <ol className="space-y-3">
          {triggers.fields.map((f, i) => (
            <li key={f.id} className="rounded border border-steel-300 bg-steel-50 p-3">
              <div className="mb-2 flex items-center justify-between">
                <span className="font-semibold">Trigger {i + 1}</span>
                {triggers.fields.length > 1 ? (
                  <Button variant="ghost" onClick={() => triggers.remove(i)}>
                    Remove trigger {i + 1}
                  </Button>
                ) : null}
              </div>
              <TriggerFields
                index={i}
                control={control}
                register={register}
                errors={errs}
                meters={meters}
                timeZone={lookups.timeZone}
                onKind={(k) => triggers.update(i, blank(k, lookups.timeZone))}
              />
            </li>
          ))}
        </ol>
        {triggers.fields.length < 6 ? (
          <Button variant="secondary" onClick={() => triggers.append(blank('calendar-floating', lookups.timeZone))}>
            Add a trigger
          </Button>
        ) : null}
        <div className="grid gap-4 md:grid-cols-2">
          <TextField
            label="“Coming up” from this many days before"
            hint="Before a date, or before a meter is forecast to reach its mark. The same span is the grace before “Past due”."
            inputMode="decimal"
            error={errs.dueSoonDays?.message}
            {...register('dueSoonDays', { setValueAs: (x) => (x === '' || x === null ? null : Number(x)) })}
          />
          <Controller
            control={control}
            name="dueSoonFraction"
            render={({ field, fieldState }) => (
              <TextField
                label="…or this share of the interval (%)"
                hint="Whichever is longer. Meters: 10 % of every 1,000 h shows “Coming up” from 900 h."
                inputMode="decimal"
                error={fieldState.error?.message}
                value={field.value === null || field.value === undefined ? '' : String(Math.round(field.value * 1000) / 10)}
                onChange={(e) => field.onChange(e.target.value === '' ? null : Number(e.target.value) / 100)}
                onBlur={field.onBlur}
                name={field.name}
              />
            )}
          />
        </div>
      </section>

      <section className="space-y-3" aria-labelledby="plan-checklist">
        <h2 id="plan-checklist" className="text-lg font-bold">
          Checklist
        </h2>
        {errs.checklist?.message || errs.checklist?.root?.message ? (
          <p className="text-sm font-semibold text-danger" role="alert">
            {errs.checklist?.message ?? errs.checklist?.root?.message}
          </p>
        ) : null}
        <ol className="space-y-3">
          {checklist.fields.map((f, i) => {
            const e = errs.checklist?.[i];
            const kind = lines?.[i]?.kind;
            return (
              <li key={f.id} className="grid gap-2 rounded border border-steel-300 p-3 md:grid-cols-[1fr_10rem_auto]">
                <input type="hidden" {...register(`checklist.${i}.key` as const)} />
                <TextField label={`Line ${i + 1}`} error={e?.label?.message} {...register(`checklist.${i}.label` as const)} />
                <SelectField
                  label="Answer"
                  options={[
                    { value: 'check', label: 'OK / Not OK' },
                    { value: 'measure', label: 'Measured value' },
                  ]}
                  {...register(`checklist.${i}.kind` as const)}
                />
                <Button variant="ghost" className="md:mt-6" onClick={() => checklist.remove(i)}>
                  Remove line {i + 1}
                </Button>
                {kind === 'measure' ? (
                  <div className="grid grid-cols-3 gap-2 md:col-span-3">
                    <TextField label="Unit" error={e?.unit?.message} {...register(`checklist.${i}.unit` as const)} />
                    <TextField
                      label="Lowest OK"
                      inputMode="decimal"
                      error={e?.min?.message}
                      {...register(`checklist.${i}.min` as const, { setValueAs: num })}
                    />
                    <TextField
                      label="Highest OK"
                      inputMode="decimal"
                      error={e?.max?.message}
                      {...register(`checklist.${i}.max` as const, { setValueAs: num })}
                    />
                  </div>
                ) : null}
              </li>
            );
          })}
        </ol>
        <Button variant="secondary" onClick={() => checklist.append({ key: `line-${Math.random().toString(36).slice(2, 8)}`, label: '', kind: 'check' })}>
          Add a checklist line
        </Button>
      </section>

      <section className="space-y-3" aria-labelledby="plan-parts">
        <h2 id="plan-parts" className="text-lg font-bold">
          Parts to have ready
        </h2>
        <ul className="space-y-2">
          {parts.fields.map((f, i) => (
            <li key={f.id} className="grid gap-2 md:grid-cols-[1fr_10rem_auto]">
              <SelectField
                label={`Part ${i + 1}`}
                error={errs.parts?.[i]?.partTypeId?.message}
                options={[{ value: '', label: 'Choose…' }, ...lookups.parts.map((p) => ({ value: p.id, label: `${p.partNumber} · ${p.name}` }))]}
                {...register(`parts.${i}.partTypeId` as const)}
              />
              <TextField
                label="Quantity"
                inputMode="decimal"
                error={errs.parts?.[i]?.quantity?.message}
                {...register(`parts.${i}.quantity` as const, { setValueAs: num })}
              />
              <Button variant="ghost" className="md:mt-6" onClick={() => parts.remove(i)}>
                Remove part {i + 1}
              </Button>
            </li>
          ))}
        </ul>
        <Button variant="secondary" onClick={() => parts.append({ partTypeId: '', quantity: 1 })}>
          Add a part
        </Button>
      </section>

      <section className="grid gap-4 md:grid-cols-2" aria-labelledby="plan-who">
        <h2 id="plan-who" className="text-lg font-bold md:col-span-2">
          Who
        </h2>
        <SelectField
          label="Role responsible"
          error={errs.responsibleRole?.message}
          options={[{ value: '', label: 'No role' }, ...ROLES.map((r) => ({ value: r, label: ROLE_LABELS[r] }))]}
          {...register('responsibleRole', { setValueAs: (v) => (v ? v : null) })}
        />
        <SelectField
          label="Person (optional; otherwise anyone in the role)"
          error={errs.responsibleUserId?.message}
          options={[
            { value: '', label: 'Anyone in the role' },
            ...lookups.people.map((p) => ({ value: p.userId, label: `${p.name} (${ROLE_LABELS[p.role]})` })),
          ]}
          {...register('responsibleUserId', { setValueAs: (v) => (v ? v : null) })}
        />
        <label className="flex min-h-touch items-center gap-3">
          <input type="checkbox" className="h-6 w-6" {...register('active')} /> Plan in use (unticked: paused, raises no work)
        </label>
      </section>
      <div className="flex flex-wrap items-center gap-3">
        <Button type="submit" busy={formState.isSubmitting}>
          {submitLabel}
        </Button>
        <Link className="inline-flex min-h-touch items-center rounded px-4 font-semibold text-steel-800 underline" to={cancelHref}>
          Cancel
        </Link>
      </div>
    </form>
  );
}
