import { useState } from 'react';
import { useFieldArray, useForm, useWatch, type FieldErrors, type Resolver } from 'react-hook-form';
import { Button } from '../../../components/ui/button';
import { TextField } from '../../../components/ui/field';
import { Notice, Panel, FormMessages } from '../../../components/ui/notice';
import { applyServerErrors } from '../../../lib/form-errors';
import { PLASMA_ARC_CUTTING_SHADES } from '../../../../shared/domain/shade';
import { shadeBandLabel } from './format';
import { safetySettingsSchema, WEEKDAYS, type SafetySettings, type SafetySettingsView } from '../../../../shared/schemas/safety-records';
import { useUpdateSafetySettings } from '../api/update-safety-settings';

type Band = { label: string; fromA: string; toA: string; minimum: string; suggested: string };
type FormValues = {
  fireWatchRequired: boolean;
  fireWatchRule: SafetySettings['fireWatchRule'];
  hearingRequiredFromDbA: string;
  hearingRuleSource: string;
  siteShade: boolean;
  shadeSource: string;
  bands: Band[];
  shiftStarts: string;
  workDays: string[];
  inspectionIntervalMonths: string;
};
const DAY_LABELS: Record<(typeof WEEKDAYS)[number], string> = { MO: 'Mon', TU: 'Tue', WE: 'Wed', TH: 'Thu', FR: 'Fri', SA: 'Sat', SU: 'Sun' };

const toSettings = (v: FormValues): SafetySettings => ({
  fireWatchRequired: v.fireWatchRequired,
  fireWatchRule: v.fireWatchRule,
  hearingRequiredFromDbA: Number(v.hearingRequiredFromDbA),
  hearingRuleSource: v.hearingRuleSource,
  shadeTable: v.siteShade
    ? {
        source: v.shadeSource,
        notes: [],
        bands: v.bands.map((b) => ({ label: b.label, fromA: Number(b.fromA), toA: Number(b.toA), minimum: Number(b.minimum), suggested: Number(b.suggested) })),
      }
    : null,
  shiftStarts: v.shiftStarts
    .split(',')
    .map((s) => s.trim())
    .filter(Boolean),
  workDays: v.workDays as SafetySettings['workDays'],
  inspectionIntervalMonths: Number(v.inspectionIntervalMonths),
});

const fromSettings = (s: SafetySettingsView): FormValues => {
  const t = s.shadeTable ?? PLASMA_ARC_CUTTING_SHADES;
  return {
    fireWatchRequired: s.fireWatchRequired,
    fireWatchRule: s.fireWatchRule,
    hearingRequiredFromDbA: String(s.hearingRequiredFromDbA),
    hearingRuleSource: s.hearingRuleSource,
    siteShade: s.shadeTable !== null,
    shadeSource: s.shadeTable ? t.source : '',
    // The built-in table's names are lower-case words; a site copy starts from readable names.
    bands: t.bands.map((b) => ({
      label: s.shadeTable ? b.label : b.label.charAt(0).toUpperCase() + b.label.slice(1),
      fromA: String(b.fromA),
      toA: String(b.toA),
      minimum: String(b.minimum),
      suggested: String(b.suggested),
    })),
    shiftStarts: s.shiftStarts.join(', '),
    workDays: s.workDays,
    inspectionIntervalMonths: String(s.inspectionIntervalMonths),
  };
};

const resolver: Resolver<FormValues> = async (values) => {
  const r = safetySettingsSchema.safeParse(toSettings(values));
  if (r.success) return { values, errors: {} };
  const errors: Record<string, unknown> = {};
  for (const i of r.error.issues) {
    const p = i.path.map(String);
    let key = p[0];
    if (p[0] === 'shadeTable') key = p[1] === 'source' ? 'shadeSource' : 'bands';
    if (p[0] === 'shiftStarts') key = 'shiftStarts';
    errors[key] ??= { type: 'validation', message: i.message };
  }
  return { values: {}, errors: errors as FieldErrors<FormValues> };
};

/** The site's own choices where codes differ: fire-watch rule, hearing threshold, lens-shade table, shifts, inspection interval. */
export function SafetySettingsForm({ settings }: { settings: SafetySettingsView }) {
  const update = useUpdateSafetySettings();
  const [done, setDone] = useState<string | null>(null);
  const [formError, setFormError] = useState<string | null>(null);
  const { register, control, handleSubmit, setError, formState } = useForm<FormValues>({ resolver, defaultValues: fromSettings(settings) });
  const { fields, append, remove } = useFieldArray({ control, name: 'bands' });
  const siteShade = useWatch({ control, name: 'siteShade' });
  const e = formState.errors;
  const submit = handleSubmit(async (v) => {
    setDone(null);
    setFormError(null);
    try {
      await update.mutateAsync(toSettings(v));
      setDone('Settings saved. PPE requirements and new fire watches use them from now on.');
    } catch (err) {
      setFormError(
        applyServerErrors(err, setError, [
          'fireWatchRequired',
          'fireWatchRule',
          'hearingRequiredFromDbA',
          'hearingRuleSource',
          'shiftStarts',
          'workDays',
          'inspectionIntervalMonths',
        ]) ?? null,
      );
      if (
        err &&
        typeof err === 'object' &&
        'fields' in err &&
        (err as { fields: { path: string; message: string }[] }).fields.some((f) => f.path === 'shadeTable')
      ) {
        setError('bands', {
          type: 'server',
          message: (err as { fields: { path: string; message: string }[] }).fields.find((f) => f.path === 'shadeTable')!.message,
        });
      }
    }
  });
  return (
    <form onSubmit={submit} noValidate aria-label="Site safety settings" className="space-y-4">
      {done ? (
        <Notice tone="safe" role="status">
          {done}
        </Notice>
      ) : null}
      <FormMessages error={formError} />
      <Panel title="Fire watch after hot work">
        <label className="mb-3 flex min-h-touch items-center gap-3">
          <input type="checkbox" className="h-6 w-6" {...register('fireWatchRequired')} />
          This site requires a fire watch after plasma cutting
        </label>
        <fieldset className="space-y-2">
          <legend className="text-sm font-semibold">Rule for how long the watch lasts</legend>
          {settings.defaults.fireWatch.map((r) => (
            <label key={r.id} className="flex min-h-touch items-start gap-3 rounded border border-steel-300 bg-white p-3">
              <input type="radio" value={r.id} className="mt-1 h-6 w-6" {...register('fireWatchRule')} />
              <span>
                <strong>{r.label}</strong>
                <span className="block text-sm">{r.description}</span>
                <span className="block text-xs text-steel-600">Source: {r.source}</span>
              </span>
            </label>
          ))}
        </fieldset>
      </Panel>
      <Panel title="Hearing protection">
        <div className="grid gap-4 md:grid-cols-[14rem_1fr]">
          <TextField
            label="Required from an 8-h TWA of (dBA)"
            inputMode="decimal"
            error={e.hearingRequiredFromDbA?.message}
            {...register('hearingRequiredFromDbA')}
          />
          <TextField
            label="Rule and its source"
            hint={`Default: ${settings.defaults.hearingRuleSource}`}
            error={e.hearingRuleSource?.message}
            {...register('hearingRuleSource')}
          />
        </div>
        <p className="mt-2 text-sm text-steel-700">The TWA itself follows OSHA 29 CFR 1910.95 App. A (90 dBA criterion, 5 dB exchange rate).</p>
      </Panel>
      <Panel title="Filter-lens shade for plasma cutting">
        <label className="mb-3 flex min-h-touch items-center gap-3">
          <input type="checkbox" className="h-6 w-6" {...register('siteShade')} />
          Use the site’s own table instead of the OSHA 1910.133(a)(5) table below
        </label>
        {siteShade ? (
          <div className="space-y-3">
            <TextField label="Source of the site table" error={e.shadeSource?.message} {...register('shadeSource')} />
            {fields.map((f, i) => (
              <fieldset key={f.id} className="grid grid-cols-2 gap-2 rounded border border-steel-300 p-2 md:grid-cols-6 md:items-end">
                <legend className="sr-only">Band {i + 1}</legend>
                <TextField label={`Band ${i + 1} name`} {...register(`bands.${i}.label`)} />
                <TextField label="From (A)" inputMode="decimal" {...register(`bands.${i}.fromA`)} />
                <TextField label="To (A)" inputMode="decimal" {...register(`bands.${i}.toA`)} />
                <TextField label="Minimum shade" inputMode="numeric" {...register(`bands.${i}.minimum`)} />
                <TextField label="Suggested shade" inputMode="numeric" {...register(`bands.${i}.suggested`)} />
                <Button variant="ghost" onClick={() => remove(i)} disabled={fields.length === 1}>
                  Remove band {i + 1}
                </Button>
              </fieldset>
            ))}
            {e.bands?.message ? (
              <p role="alert" className="font-semibold text-danger">
                {e.bands.message}
              </p>
            ) : null}
            <Button variant="secondary" onClick={() => append({ label: '', fromA: '', toA: '', minimum: '', suggested: '' })}>
              Add band
            </Button>
          </div>
        ) : (
          <div>
            <p className="mb-1 text-sm text-steel-700">In use: {PLASMA_ARC_CUTTING_SHADES.source}</p>
            <table className="text-sm" aria-label="Plasma cutting shades in use">
              <thead>
                <tr>
                  <th className="pr-4 text-left">Band (arc current)</th>
                  <th className="pr-4 text-left">Minimum</th>
                  <th className="text-left">Suggested</th>
                </tr>
              </thead>
              <tbody>
                {PLASMA_ARC_CUTTING_SHADES.bands.map((b) => (
                  <tr key={b.label}>
                    <td className="pr-4">{shadeBandLabel(b)}</td>
                    <td className="pr-4">{b.minimum}</td>
                    <td>{b.suggested}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        )}
      </Panel>
      <Panel title="Shifts and inspections">
        <div className="grid gap-4 md:grid-cols-3">
          <TextField
            label="Shift starts (24-hour, comma-separated)"
            hint="PPE checks are due at each shift start"
            error={e.shiftStarts?.message}
            {...register('shiftStarts')}
          />
          <fieldset>
            <legend className="text-sm font-semibold">Work days</legend>
            <div className="flex flex-wrap gap-2">
              {WEEKDAYS.map((d) => (
                <label key={d} className="flex min-h-touch items-center gap-2 rounded border border-steel-300 bg-white px-2">
                  <input type="checkbox" className="h-5 w-5" value={d} {...register('workDays')} />
                  {DAY_LABELS[d]}
                </label>
              ))}
            </div>
            {e.workDays?.message ? (
              <p role="alert" className="text-sm font-semibold text-danger">
                {e.workDays.message}
              </p>
            ) : null}
          </fieldset>
          <TextField
            label="Periodic inspection every (months)"
            hint="OSHA 29 CFR 1910.147(c)(6): at least every 12"
            inputMode="numeric"
            error={e.inspectionIntervalMonths?.message}
            {...register('inspectionIntervalMonths')}
          />
        </div>
      </Panel>
      <div className="flex justify-end">
        <Button type="submit" busy={formState.isSubmitting}>
          Save settings
        </Button>
      </div>
    </form>
  );
}
