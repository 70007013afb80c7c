import { useEffect, useRef, useState } from 'react';
import { Controller, useFieldArray, useForm, type FieldErrors, type Resolver } from 'react-hook-form';
import { SelectField, TextField } from '../../../components/ui/field';
import { Button } from '../../../components/ui/button';
import { Notice, Panel, FormMessages } from '../../../components/ui/notice';
import { applyServerErrors } from '../../../lib/form-errors';
import {
  createProcedureSchema,
  ENERGY_KIND_LABELS,
  ENERGY_KINDS,
  nextPointTag,
  PHASE_LABELS,
  PROCEDURE_PHASES,
  pointTag,
  procedureContentSchema,
  type EnergySource,
  type FeedingPoint,
  type ProcedureContent,
  type ProcedurePhase,
} from '../../../../shared/schemas/safety-procedures';
import { copyOfPoint, FeedsPicker, SharedPointOffer, type PlantMachine } from './shared-points';

/** Steps are typed one per line; the shared schema checks them as lists. */
type FormValues = { machineId: string; title: string; scope: string; sources: EnergySource[]; steps: Record<ProcedurePhase, string>; release: string };

const lines = (s: string) =>
  s
    .split('\n')
    .map((x) => x.trim())
    .filter(Boolean);

export const toContent = (v: FormValues): ProcedureContent => ({
  title: v.title,
  scope: v.scope,
  // An empty list of fed machines is the same as none.
  sources: v.sources.map(({ feeds, ...s }) => (feeds?.length ? { ...s, feeds } : s)),
  steps: Object.fromEntries(PROCEDURE_PHASES.map((p) => [p, lines(v.steps[p] ?? '')])) as ProcedureContent['steps'],
  release: lines(v.release),
});

const fromContent = (c: ProcedureContent | undefined, machineId: string, machineCode: string): FormValues => ({
  machineId,
  title: c?.title ?? '',
  scope: c?.scope ?? '',
  sources: c?.sources ?? [
    {
      key: pointTag(machineCode, 1),
      kind: 'electrical',
      description: '',
      magnitude: '',
      isolationDevice: '',
      location: '',
      relieveMethod: '',
      verifyMethod: '',
    },
  ],
  steps: Object.fromEntries(PROCEDURE_PHASES.map((p) => [p, (c?.steps[p] ?? []).join('\n')])) as Record<ProcedurePhase, string>,
  release: (c?.release ?? []).join('\n'),
});

function setIn(target: Record<string, unknown>, path: string[], value: unknown) {
  let o: Record<string, unknown> = target;
  path.forEach((k, i) => {
    if (i === path.length - 1) {
      if (o[k] === undefined) o[k] = value;
      return;
    }
    o[k] ??= /^\d+$/.test(path[i + 1]) ? [] : {};
    o = o[k] as Record<string, unknown>;
  });
}

/** Errors on one step line belong to that phase's text box. */
function fieldPath(path: PropertyKey[]): string[] {
  const p = path.map(String);
  if (p[0] === 'steps') return p.slice(0, 2);
  if (p[0] === 'release') return ['release'];
  return p;
}

const makeResolver =
  (creating: boolean): Resolver<FormValues> =>
  async (values) => {
    const content = toContent(values);
    const r = creating ? createProcedureSchema.safeParse({ ...content, machineId: values.machineId }) : procedureContentSchema.safeParse(content);
    if (r.success) return { values, errors: {} };
    const errors: Record<string, unknown> = {};
    for (const issue of r.error.issues) setIn(errors, fieldPath(issue.path), { type: 'validation', message: issue.message });
    return { values: {}, errors: errors as FieldErrors<FormValues> };
  };

const area = 'block min-h-24 w-full rounded border bg-white px-3 py-2 text-base';

/** Writes or edits a draft version. Steps are grouped by the phases of OSHA 29 CFR 1910.147(d), in that order. */
export function ProcedureForm({
  initial,
  machines,
  fixedMachine,
  plant = [],
  submitLabel,
  onSubmit,
}: {
  initial?: ProcedureContent;
  machines?: { id: string; code: string; label: string }[];
  fixedMachine?: { id: string; code: string; label: string };
  /** The shop's machines with the shared points that feed each (for "also feeds" and the shared-point offer). */
  plant?: (PlantMachine & { feedingPoints: FeedingPoint[] })[];
  submitLabel: string;
  onSubmit: (input: { machineId: string; content: ProcedureContent }) => Promise<void>;
}) {
  const creating = !fixedMachine;
  const [formError, setFormError] = useState<string | null>(null);
  const { register, control, handleSubmit, setError, formState, watch, getValues, setValue } = useForm<FormValues>({
    resolver: makeResolver(creating),
    defaultValues: fromContent(initial, machines?.[0]?.id ?? '', fixedMachine?.code ?? machines?.[0]?.code ?? ''),
  });
  const { fields, append, remove } = useFieldArray({ control, name: 'sources' });
  const machineId = watch('machineId');
  const machineCode = fixedMachine?.code ?? machines?.find((m) => m.id === machineId)?.code ?? '';
  const ownMachineId = fixedMachine?.id ?? machineId;
  const feedingPoints = plant.find((m) => m.id === ownMachineId)?.feedingPoints ?? [];
  const sourceKeys = watch('sources').map((x) => x.key);
  // Choosing another machine renames the tags that still follow the previous machine's scheme.
  const prevCode = useRef(machineCode);
  useEffect(() => {
    const prev = prevCode.current;
    prevCode.current = machineCode;
    if (!prev || prev === machineCode) return;
    getValues('sources').forEach((src, i) => {
      const n = Array.from({ length: 20 }, (_, k) => k + 1).find((k) => pointTag(prev, k) === src.key);
      if (n) setValue(`sources.${i}.key`, pointTag(machineCode, n));
    });
  }, [machineCode, getValues, setValue]);
  const e = formState.errors;
  const submit = handleSubmit(async (v) => {
    setFormError(null);
    try {
      await onSubmit({ machineId: v.machineId, content: toContent(v) });
    } catch (err) {
      const names = [
        'machineId',
        'title',
        'scope',
        'sources',
        'release',
        ...PROCEDURE_PHASES.map((p) => `steps.${p}`),
        ...v.sources.flatMap((_, i) => Object.keys(v.sources[0]).map((k) => `sources.${i}.${k}`)),
      ];
      setFormError(applyServerErrors(err, setError, names));
    }
  });

  return (
    <form onSubmit={submit} noValidate aria-label="Energy-control procedure" className="space-y-4">
      <FormMessages error={formError} />
      {Object.keys(e).length ? (
        <Notice tone="danger" role="alert">
          Some fields need attention; they are marked below.
        </Notice>
      ) : null}
      <Panel title="What the procedure covers">
        <div className="grid gap-4 md:grid-cols-2">
          {creating ? (
            <SelectField
              label="Machine"
              error={e.machineId?.message}
              options={[{ value: '', label: 'Choose a machine' }, ...(machines ?? []).map((m) => ({ value: m.id, label: m.label }))]}
              {...register('machineId')}
            />
          ) : (
            <p className="self-center font-semibold">Machine: {fixedMachine?.label}</p>
          )}
          <TextField label="Title" error={e.title?.message} {...register('title')} />
          <div className="md:col-span-2 space-y-1">
            <label htmlFor="proc-scope" className="block text-sm font-semibold">
              Scope: which work this procedure is for
            </label>
            <textarea id="proc-scope" className={`${area} ${e.scope ? 'border-danger' : 'border-steel-400'}`} {...register('scope')} />
            {e.scope ? (
              <p role="alert" className="text-sm font-semibold text-danger">
                {e.scope.message}
              </p>
            ) : null}
          </div>
        </div>
      </Panel>

      <Panel
        title="Energy sources and isolation points"
        actions={
          <Button
            variant="secondary"
            onClick={() =>
              append({
                key: nextPointTag(
                  machineCode,
                  getValues('sources').map((x) => x.key),
                ),
                kind: 'other',
                description: '',
                magnitude: '',
                isolationDevice: '',
                location: '',
                relieveMethod: '',
                verifyMethod: '',
              })
            }
          >
            Add energy source
          </Button>
        }
      >
        {e.sources?.message ? (
          <p role="alert" className="mb-2 font-semibold text-danger">
            {e.sources.message}
          </p>
        ) : null}
        <div className="mb-4">
          <SharedPointOffer points={feedingPoints} presentKeys={sourceKeys} onAdd={(p) => append(copyOfPoint(p))} />
        </div>
        <div className="space-y-4">
          {fields.map((f, i) => {
            const se = e.sources?.[i];
            return (
              <fieldset key={f.id} className="grid gap-3 rounded border border-steel-300 bg-steel-50 p-3 md:grid-cols-4">
                <legend className="px-1 font-bold">Energy source {i + 1}</legend>
                <TextField
                  label="Tag at the point"
                  hint={`e.g. ${pointTag(machineCode || 'C2', i + 1)}: machine code, E and a number`}
                  error={se?.key?.message}
                  {...register(`sources.${i}.key`)}
                />
                <SelectField
                  label="Kind of energy"
                  options={ENERGY_KINDS.map((k) => ({ value: k, label: ENERGY_KIND_LABELS[k] }))}
                  {...register(`sources.${i}.kind`)}
                />
                <TextField label="Description" error={se?.description?.message} {...register(`sources.${i}.description`)} />
                <TextField label="Magnitude" hint="e.g. 480 V 3-phase; 210 bar" error={se?.magnitude?.message} {...register(`sources.${i}.magnitude`)} />
                <TextField label="Isolation device" error={se?.isolationDevice?.message} {...register(`sources.${i}.isolationDevice`)} />
                <TextField label="Location of the device" error={se?.location?.message} {...register(`sources.${i}.location`)} />
                <TextField label="How stored energy is relieved" error={se?.relieveMethod?.message} {...register(`sources.${i}.relieveMethod`)} />
                <TextField label="How isolation is verified" error={se?.verifyMethod?.message} {...register(`sources.${i}.verifyMethod`)} />
                <Controller
                  control={control}
                  name={`sources.${i}.feeds`}
                  render={({ field }) => (
                    <FeedsPicker
                      sourceLabel={sourceKeys[i] || `energy source ${i + 1}`}
                      machines={plant}
                      ownMachineId={ownMachineId}
                      value={field.value ?? []}
                      onChange={field.onChange}
                      error={se?.feeds?.message ?? se?.feeds?.[0]?.message}
                    />
                  )}
                />
                <div className="md:col-span-4 flex justify-end">
                  <Button variant="ghost" onClick={() => remove(i)} disabled={fields.length === 1}>
                    Remove energy source {i + 1}
                  </Button>
                </div>
              </fieldset>
            );
          })}
        </div>
      </Panel>

      <Panel title="Steps, in the order of OSHA 29 CFR 1910.147(d) — one step per line">
        <div className="grid gap-4 md:grid-cols-2">
          {PROCEDURE_PHASES.map((phase, i) => {
            const err = e.steps?.[phase]?.message;
            return (
              <div key={phase} className="space-y-1">
                <label htmlFor={`steps-${phase}`} className="block text-sm font-semibold">
                  {i + 1}. {PHASE_LABELS[phase].title} <span className="font-normal text-steel-600">({PHASE_LABELS[phase].source})</span>
                </label>
                <textarea
                  id={`steps-${phase}`}
                  aria-invalid={err ? true : undefined}
                  className={`${area} ${err ? 'border-danger' : 'border-steel-400'}`}
                  {...register(`steps.${phase}`)}
                />
                {err ? (
                  <p role="alert" className="text-sm font-semibold text-danger">
                    {err}
                  </p>
                ) : null}
              </div>
            );
          })}
          <div className="space-y-1 md:col-span-2">
            <label htmlFor="steps-release" className="block text-sm font-semibold">
              Release from lockout <span className="font-normal text-steel-600">(1910.147(e))</span>
            </label>
            <textarea
              id="steps-release"
              aria-invalid={e.release ? true : undefined}
              className={`${area} ${e.release ? 'border-danger' : 'border-steel-400'}`}
              {...register('release')}
            />
            {e.release ? (
              <p role="alert" className="text-sm font-semibold text-danger">
                {e.release.message}
              </p>
            ) : null}
          </div>
        </div>
      </Panel>
      <div className="flex justify-end">
        <Button type="submit" busy={formState.isSubmitting}>
          {submitLabel}
        </Button>
      </div>
    </form>
  );
}
