import { useMemo, useState } from 'react';
import { useFieldArray, useForm, useWatch, type FieldErrors, type Resolver } from 'react-hook-form';
import { createColumnHelper } from '@tanstack/react-table';
import { DataTable } from '../../../components/ui/data-table';
import { Button } from '../../../components/ui/button';
import { SelectField, TextField } from '../../../components/ui/field';
import { Badge, EmptyState, Notice, Panel, FormMessages } from '../../../components/ui/notice';
import { ConfirmDialog } from '../../../components/ui/confirm-dialog';
import { applyServerErrors } from '../../../lib/form-errors';
import {
  CADENCE_LABELS,
  CHECK_CADENCES,
  PPE_ITEM_INFO,
  PPE_ITEMS,
  ppeRequirementSchema,
  type PpeItem,
  type PpeRequirementInput,
  type PpeRequirementRow,
} from '../../../../shared/schemas/safety-ppe';
import { deriveRequiredItems } from '../../../../shared/schemas/safety-ppe-derive';
import type { ShadeTable } from '../../../../shared/domain/shade';
import { usePpeRequirements } from '../api/get-ppe-requirements';
import { useSavePpeRequirement } from '../api/save-ppe-requirement';
import { useRetirePpeRequirement } from '../api/retire-ppe-requirement';
import { useSafetyMachines } from '../api/get-safety-machines';
import { useSafetySettings } from '../api/get-safety-settings';
import { NoiseVerdicts, PersonDailyDose } from './noise-verdicts';
import { useShopFormat } from '../../../lib/format';

type FormValues = {
  machineId: string;
  task: string;
  items: PpeItem[];
  otherItems: string;
  arcCurrentA: string;
  noise: { levelDbA: string; hours: string }[];
  peakDbC: string;
  protectorNrr: string;
  cadence: PpeRequirementInput['cadence'];
};

const num = (s: string) => (s.trim() === '' ? NaN : Number(s));
const toInput = (v: FormValues) => ({
  machineId: v.machineId,
  task: v.task,
  items: v.items ?? [],
  otherItems: v.otherItems
    .split(',')
    .map((s) => s.trim())
    .filter(Boolean),
  arcCurrentA: v.arcCurrentA.trim() === '' ? null : num(v.arcCurrentA),
  noise: v.noise.map((n) => ({ levelDbA: num(n.levelDbA), hours: num(n.hours) })),
  peakDbC: (v.peakDbC ?? '').trim() === '' ? null : num(v.peakDbC),
  protectorNrr: (v.protectorNrr ?? '').trim() === '' ? null : num(v.protectorNrr),
  cadence: v.cadence,
});

const resolver: Resolver<FormValues> = async (values) => {
  const r = ppeRequirementSchema.safeParse(toInput(values));
  if (r.success) return { values, errors: {} };
  const errors: Record<string, unknown> = {};
  for (const i of r.error.issues) {
    const [head, idx, leaf] = i.path.map(String);
    if (head === 'noise' && idx !== undefined && leaf) {
      const arr = (errors.noise ??= []) as Record<string, unknown>[];
      arr[Number(idx)] ??= {};
      arr[Number(idx)][leaf] ??= { type: 'validation', message: i.message };
    } else errors[head === 'otherItems' ? 'otherItems' : head] ??= { type: 'validation', message: i.message };
  }
  return { values: {}, errors: errors as FieldErrors<FormValues> };
};

const blank: FormValues = {
  machineId: '',
  task: '',
  items: ['safety-glasses', 'safety-footwear'],
  otherItems: '',
  arcCurrentA: '',
  noise: [],
  peakDbC: '',
  protectorNrr: '',
  cadence: 'shift',
};
const fromRow = (r: PpeRequirementRow): FormValues => ({
  machineId: r.machineId,
  task: r.task,
  items: r.items,
  otherItems: r.otherItems.join(', '),
  arcCurrentA: r.arcCurrentA === null ? '' : String(r.arcCurrentA),
  noise: r.noise.map((n) => ({ levelDbA: String(n.levelDbA), hours: String(n.hours) })),
  peakDbC: r.peakDbC === null ? '' : String(r.peakDbC),
  protectorNrr: r.protectorNrr === null ? '' : String(r.protectorNrr),
  cadence: r.cadence,
});

function RequirementForm({ editing, onDone }: { editing: PpeRequirementRow | null; onDone: (msg: string) => void }) {
  const machines = useSafetyMachines();
  const settings = useSafetySettings();
  const save = useSavePpeRequirement();
  const [formError, setFormError] = useState<string | null>(null);
  const { register, control, handleSubmit, setError, reset, formState } = useForm<FormValues>({ resolver, defaultValues: editing ? fromRow(editing) : blank });
  const { fields, append, remove } = useFieldArray({ control, name: 'noise' });
  const live = useWatch({ control });
  const preview = useMemo(() => {
    if (!settings.data) return null;
    const input = toInput({ ...blank, ...live, noise: (live.noise ?? []) as FormValues['noise'], items: (live.items ?? []) as PpeItem[] } as FormValues);
    if (input.arcCurrentA !== null && !Number.isFinite(input.arcCurrentA)) return null;
    if ((input.peakDbC !== null && !Number.isFinite(input.peakDbC)) || (input.protectorNrr !== null && !Number.isFinite(input.protectorNrr))) return null;
    const noise = input.noise.filter((n) => Number.isFinite(n.levelDbA) && Number.isFinite(n.hours));
    try {
      return deriveRequiredItems(
        { ...input, noise },
        {
          shadeTable: settings.data.shadeTable as ShadeTable | null,
          hearingRequiredFromDbA: settings.data.hearingRequiredFromDbA,
          hearingRuleSource: settings.data.hearingRuleSource,
        },
      );
    } catch {
      return null;
    }
  }, [live, settings.data]);
  const e = formState.errors;
  const submit = handleSubmit(async (v) => {
    setFormError(null);
    try {
      await save.mutateAsync({ id: editing?.id, input: toInput(v) as PpeRequirementInput });
      reset(blank);
      onDone(editing ? `Requirement “${v.task}” updated.` : `Requirement “${v.task}” added.`);
    } catch (err) {
      setFormError(
        applyServerErrors(err, setError, ['machineId', 'task', 'items', 'otherItems', 'arcCurrentA', 'noise', 'peakDbC', 'protectorNrr', 'cadence']),
      );
    }
  });

  return (
    <form onSubmit={submit} noValidate aria-label="PPE requirement" className="grid gap-4 lg:grid-cols-[1fr_22rem]">
      <div className="space-y-4">
        <FormMessages error={formError} />
        <div className="grid gap-4 md:grid-cols-3">
          <SelectField
            label="Machine"
            error={e.machineId?.message}
            options={[{ value: '', label: 'Choose a machine' }, ...(machines.data ?? []).map((m) => ({ value: m.id, label: `${m.code} · ${m.name}` }))]}
            {...register('machineId')}
          />
          <TextField label="Task" hint="e.g. Plasma cutting, Tool change" error={e.task?.message} {...register('task')} />
          <SelectField label="Check" options={CHECK_CADENCES.map((c) => ({ value: c, label: CADENCE_LABELS[c] }))} {...register('cadence')} />
        </div>
        <fieldset className="space-y-2">
          <legend className="text-sm font-semibold">Items always required for this task</legend>
          <div className="grid gap-2 md:grid-cols-2">
            {PPE_ITEMS.filter((i) => i !== 'filter-lens' && i !== 'hearing-protection').map((i) => (
              <label key={i} className="flex min-h-touch items-center gap-3 rounded border border-steel-300 bg-white px-3">
                <input type="checkbox" value={i} className="h-6 w-6" {...register('items')} />
                <span>
                  {PPE_ITEM_INFO[i].label} <span className="block text-xs text-steel-600">{PPE_ITEM_INFO[i].source}</span>
                </span>
              </label>
            ))}
          </div>
          {e.items?.message ? (
            <p role="alert" className="text-sm font-semibold text-danger">
              {e.items.message}
            </p>
          ) : null}
          <p className="text-sm text-steel-700">The filter lens and hearing protection are added from the arc current and the noise below.</p>
        </fieldset>
        <TextField label="Other items (comma-separated)" error={e.otherItems?.message} {...register('otherItems')} />
        <TextField label="Plasma arc current (A), empty if no arc" inputMode="decimal" error={e.arcCurrentA?.message} {...register('arcCurrentA')} />
        <fieldset className="space-y-2">
          <legend className="text-sm font-semibold">Noise during a typical day at this task (for the dose, OSHA 29 CFR 1910.95 App. A)</legend>
          {fields.map((f, i) => (
            <div key={f.id} className="grid grid-cols-[1fr_1fr_auto] items-end gap-2">
              <TextField label={`Level ${i + 1} (dBA)`} inputMode="decimal" error={e.noise?.[i]?.levelDbA?.message} {...register(`noise.${i}.levelDbA`)} />
              <TextField label={`Hours at level ${i + 1}`} inputMode="decimal" error={e.noise?.[i]?.hours?.message} {...register(`noise.${i}.hours`)} />
              <Button variant="ghost" onClick={() => remove(i)}>
                Remove
              </Button>
            </div>
          ))}
          {e.noise?.message ? (
            <p role="alert" className="text-sm font-semibold text-danger">
              {e.noise.message}
            </p>
          ) : null}
          <Button variant="secondary" onClick={() => append({ levelDbA: '', hours: '' })}>
            Add a noise period
          </Button>
          <div className="grid gap-4 md:grid-cols-2">
            <TextField
              label="Impact peak (dB), empty if not measured"
              hint="Highest peak at the task, e.g. punching (limit 140 dB, OSHA 29 CFR 1910.95(b)(2))"
              inputMode="decimal"
              error={e.peakDbC?.message}
              {...register('peakDbC')}
            />
            <TextField
              label="Issued protector's NRR (dB), empty if none"
              hint="For the protected exposure (OSHA 29 CFR 1910.95 App. B)"
              inputMode="decimal"
              error={e.protectorNrr?.message}
              {...register('protectorNrr')}
            />
          </div>
        </fieldset>
        <div className="flex gap-2">
          <Button type="submit" busy={formState.isSubmitting}>
            {editing ? 'Save changes' : 'Add requirement'}
          </Button>
        </div>
      </div>
      <aside aria-label="What the operator will be asked" className="space-y-2 rounded border border-steel-300 bg-steel-50 p-3">
        <h3 className="font-bold">The check will ask for</h3>
        {preview ? (
          <>
            <ul className="space-y-1">
              {preview.required.map((i) => (
                <li key={i.code} className="rounded border-l-4 border-mandatory bg-white px-2 py-1 text-sm">
                  <strong>{i.label}</strong>
                  {i.detail ? <span className="block">{i.detail}</span> : null}
                  <span className="block text-xs text-steel-600">{i.source}</span>
                </li>
              ))}
            </ul>
            {preview.shade && !preview.shade.ok ? <Notice tone="danger">{preview.shade.message}</Notice> : null}
            {preview.hearing ? (
              <>
                <NoiseVerdicts hearing={preview.hearing} />
                <p className="text-sm">
                  {preview.hearing.required ? 'Hearing protection required' : 'Below the site threshold'} (site threshold {preview.hearing.requiredFromDbA} dBA
                  on the action-level basis, {preview.hearing.ruleSource}).
                </p>
              </>
            ) : null}
          </>
        ) : (
          <p className="text-sm text-steel-700">Enter valid numbers to see the result.</p>
        )}
      </aside>
    </form>
  );
}

const col = createColumnHelper<PpeRequirementRow>();

export function PpeRequirements() {
  const f = useShopFormat();
  const q = usePpeRequirements();
  const retire = useRetirePpeRequirement();
  const [editing, setEditing] = useState<PpeRequirementRow | null>(null);
  const [retiring, setRetiring] = useState<PpeRequirementRow | null>(null);
  const [message, setMessage] = useState<string | null>(null);
  return (
    <div className="space-y-4">
      {message ? (
        <Notice tone="safe" role="status">
          {message}
        </Notice>
      ) : null}
      <Panel
        title={editing ? `Change “${editing.task}” at ${editing.machineCode}` : 'Add a PPE requirement'}
        actions={
          editing ? (
            <Button variant="ghost" onClick={() => setEditing(null)}>
              Cancel editing
            </Button>
          ) : null
        }
      >
        <RequirementForm key={editing?.id ?? 'new'} editing={editing} onDone={(m) => (setMessage(m), setEditing(null))} />
      </Panel>
      <Panel title="Requirements in force">
        {q.isError ? <Notice tone="danger">{q.error.message}</Notice> : null}
        <DataTable
          caption="PPE requirements by machine and task"
          data={q.data ?? []}
          loading={q.isLoading}
          getRowId={(r) => r.id}
          empty={<EmptyState title="No PPE requirements yet" />}
          columns={[
            col.accessor('machineCode', { header: 'Machine' }),
            col.accessor('task', { header: 'Task' }),
            col.accessor((r) => r.required.map((i) => i.label).join(', '), {
              id: 'required',
              header: 'Required',
              cell: (c) => <span className="text-sm">{c.getValue() as string}</span>,
            }),
            col.accessor((r) => (r.shade?.ok ? r.shade.minimum : null), {
              id: 'shade',
              header: 'Lens shade',
              cell: (c) => (c.getValue() ? <Badge tone="mandatory">{`Shade ${c.getValue()}+`}</Badge> : '—'),
            }),
            col.accessor((r) => r.hearing?.twaDbA ?? null, {
              id: 'twa',
              header: 'Noise TWA (action level · PEL basis)',
              cell: (c) => {
                const h = c.row.original.hearing;
                if (!h) return '—';
                return (
                  <span className="text-sm">
                    {h.actionLevel.twaDbA ?? '—'} dBA {h.actionLevel.reached ? '(≥ action level)' : ''} · {h.pel.twaDbA ?? '—'} dBA{' '}
                    {h.pel.reached ? '(over PEL)' : h.pel.twaDbA !== null && h.pel.twaDbA >= 90 ? '(at PEL)' : ''}
                    {h.peak?.exceeded ? ' · peak over 140 dB' : ''}
                  </span>
                );
              },
            }),
            col.accessor('cadence', { header: 'Check', cell: (c) => CADENCE_LABELS[c.getValue() as PpeRequirementRow['cadence']] }),
            col.accessor('lastCheckAt', {
              header: 'Last check',
              cell: (c) => (c.getValue() ? `${f.dateTime(c.getValue() as string)} · ${c.row.original.lastCheckByName}` : 'Never'),
            }),
            col.display({
              id: 'actions',
              header: 'Actions',
              cell: (c) => (
                <span className="flex gap-2">
                  <Button variant="secondary" onClick={() => setEditing(c.row.original)}>
                    Edit
                  </Button>
                  <Button variant="ghost" onClick={() => setRetiring(c.row.original)}>
                    Retire
                  </Button>
                </span>
              ),
            }),
          ]}
        />
      </Panel>
      <Panel title="A person's daily noise dose across tasks">
        <PersonDailyDose requirements={q.data ?? []} />
      </Panel>
      <ConfirmDialog
        open={retiring !== null}
        title={`Retire “${retiring?.task}” at ${retiring?.machineCode}?`}
        confirmLabel="Retire"
        tone="danger"
        busy={retire.isPending}
        onCancel={() => setRetiring(null)}
        onConfirm={async () => {
          if (retiring) await retire.mutateAsync(retiring.id);
          setMessage(`“${retiring?.task}” retired; its past checks stay in the log.`);
          setRetiring(null);
        }}
      >
        Operators will no longer be asked for this check. Signed checks stay in the log.
      </ConfirmDialog>
    </div>
  );
}
