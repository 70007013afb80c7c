import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { MACHINE_KINDS, MACHINE_KIND_LABELS, machineInputSchema, type MachineRow } from '../../../../shared/schemas/machines';
import { SelectField, TextField } from '../../../components/ui/field';
import { Button } from '../../../components/ui/button';
import { FormMessages } from '../../../components/ui/notice';
import { applyServerErrors } from '../../../lib/form-errors';
import { useCreateMachine } from '../api/create-machine';
import { useUpdateMachine } from '../api/update-machine';

type In = z.input<typeof machineInputSchema>;
type Out = z.output<typeof machineInputSchema>;
const FIELDS = ['code', 'name', 'kind', 'parentId', 'location', 'serial', 'notes'];

/** Create a machine or component, or edit one (pass `machine`). */
export function MachineForm({
  machines,
  machine,
  defaultParentId,
  onDone,
}: {
  machines: MachineRow[];
  machine?: MachineRow;
  defaultParentId?: string;
  onDone?: (id: string) => void;
}) {
  const create = useCreateMachine();
  const update = useUpdateMachine();
  const [formError, setFormError] = useState<string | null>(null);
  const [saved, setSaved] = useState<string | null>(null);
  const { register, handleSubmit, setError, reset, formState } = useForm<In, unknown, Out>({
    resolver: zodResolver(machineInputSchema),
    defaultValues: machine
      ? {
          code: machine.code,
          name: machine.name,
          kind: machine.kind,
          parentId: machine.parentId ?? '',
          location: machine.location ?? '',
          serial: machine.serial ?? '',
          notes: machine.notes ?? '',
        }
      : { kind: defaultParentId ? 'torch' : 'punch-plasma-cell', parentId: defaultParentId ?? '' },
  });
  const onSubmit = handleSubmit(async (values) => {
    setFormError(null);
    setSaved(null);
    try {
      if (machine) {
        await update.mutateAsync({ id: machine.id, ...values });
        setSaved(`Saved ${values.code}.`);
        onDone?.(machine.id);
      } else {
        const { id } = await create.mutateAsync(values);
        setSaved(`Added ${values.code}.`);
        reset({ code: '', name: '', kind: values.kind, parentId: values.parentId ?? '', location: values.location ?? '', serial: '', notes: '' });
        onDone?.(id);
      }
    } catch (err) {
      setFormError(applyServerErrors(err, setError, FIELDS));
    }
  });
  // A machine cannot sit below itself; the server also refuses deeper loops.
  const parents = machines.filter((m) => m.id !== machine?.id);
  return (
    <form onSubmit={onSubmit} noValidate aria-label={machine ? `Edit ${machine.code}` : 'Add a machine'} className="grid gap-4 md:grid-cols-3">
      <div className="space-y-2 md:col-span-3">
        <FormMessages error={formError} saved={saved} />
      </div>
      <TextField label="Code" hint="Short, printed on the QR label, e.g. C1" autoComplete="off" error={formState.errors.code?.message} {...register('code')} />
      <TextField label="Name" autoComplete="off" error={formState.errors.name?.message} {...register('name')} />
      <SelectField
        label="Kind"
        error={formState.errors.kind?.message}
        options={MACHINE_KINDS.map((k) => ({ value: k, label: MACHINE_KIND_LABELS[k] }))}
        {...register('kind')}
      />
      <SelectField
        label="Part of"
        hint="Leave empty for a machine; choose its machine for a component"
        error={formState.errors.parentId?.message}
        options={[{ value: '', label: '— none (a machine) —' }, ...parents.map((m) => ({ value: m.id, label: `${'· '.repeat(m.depth)}${m.code} ${m.name}` }))]}
        {...register('parentId', { setValueAs: (v) => (v === '' ? null : v) })}
      />
      <TextField label="Location" autoComplete="off" error={formState.errors.location?.message} {...register('location')} />
      <TextField label="Serial number" autoComplete="off" error={formState.errors.serial?.message} {...register('serial')} />
      <div className="space-y-1 md:col-span-3">
        <label htmlFor="machine-notes" className="block text-sm font-semibold text-steel-800">
          Notes
        </label>
        <textarea id="machine-notes" rows={3} className="block w-full rounded border border-steel-400 bg-white px-3 py-2" {...register('notes')} />
        {formState.errors.notes ? (
          <p className="text-sm font-semibold text-danger" role="alert">
            {formState.errors.notes.message}
          </p>
        ) : null}
      </div>
      <div className="md:col-span-3">
        <Button type="submit" busy={formState.isSubmitting}>
          {machine ? 'Save changes' : 'Add machine'}
        </Button>
      </div>
    </form>
  );
}
