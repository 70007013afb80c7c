import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { raiseWorkOrderInput } from '../../../../shared/schemas/work-orders';
import { ROLES, ROLE_LABELS } from '../../../../shared/permissions';
import { SelectField, TextField } from '../../../components/ui/field';
import { Button } from '../../../components/ui/button';
import { Notice } from '../../../components/ui/notice';
import { applyServerErrors } from '../../../lib/form-errors';
import { useRaiseWorkOrder } from '../api/raise-work-order';
import { useLookups } from '../../../lib/lookups';
import { inputClass } from './format';
import { useShopInput } from '../../../lib/shop-time';

type In = z.input<typeof raiseWorkOrderInput>;
type Out = z.output<typeof raiseWorkOrderInput>;

/** Report a fault or ask for repair work by hand. */
export function RaiseWorkForm({
  onRaised,
  defaultMachineId,
  defaultInstructions,
}: {
  onRaised: (r: { id: string; number: number }) => void;
  defaultMachineId?: string;
  defaultInstructions?: string;
}) {
  const input = useShopInput();
  const raise = useRaiseWorkOrder();
  const lookups = useLookups();
  const [formError, setFormError] = useState<string | null>(null);
  const [dueLocal, setDueLocal] = useState('');
  const { register, handleSubmit, setError, formState } = useForm<In, unknown, Out>({
    resolver: zodResolver(raiseWorkOrderInput),
    defaultValues: {
      machineId: defaultMachineId ?? '',
      title: '',
      instructions: defaultInstructions ?? '',
      responsibleRole: 'technician',
      requiresLockout: false,
      safetyCritical: false,
      assigneeId: null,
      dueAt: null,
    },
  });
  const onSubmit = handleSubmit(async (values) => {
    setFormError(null);
    try {
      const r = await raise.mutateAsync({ ...values, dueAt: input.fromLocalInput(dueLocal) });
      onRaised(r);
    } catch (err) {
      setFormError(applyServerErrors(err, setError, ['machineId', 'title', 'instructions', 'assigneeId', 'responsibleRole', 'dueAt']));
    }
  });
  const people = lookups.data?.people ?? [];
  return (
    <form onSubmit={onSubmit} noValidate aria-label="Report work" className="grid gap-4 md:grid-cols-2">
      {formError ? (
        <div className="md:col-span-2">
          <Notice tone="danger" role="alert">
            {formError}
          </Notice>
        </div>
      ) : null}
      <SelectField
        label="Machine"
        error={formState.errors.machineId?.message}
        options={[{ value: '', label: 'Choose a machine…' }, ...(lookups.data?.machines ?? []).map((m) => ({ value: m.id, label: `${m.code} · ${m.name}` }))]}
        {...register('machineId')}
      />
      <TextField
        label="What is wrong or needed"
        error={formState.errors.title?.message}
        placeholder="e.g. Hose weeping at the pump outlet"
        {...register('title')}
      />
      <div className="space-y-1 md:col-span-2">
        <label htmlFor="raise-instructions" className="block text-sm font-semibold text-steel-800">
          Details
        </label>
        <textarea id="raise-instructions" rows={3} className={inputClass} {...register('instructions')} />
      </div>
      <div className="space-y-1">
        <label htmlFor="raise-due" className="block text-sm font-semibold text-steel-800">
          Needed by (optional, site time)
        </label>
        <input id="raise-due" type="datetime-local" className={inputClass} value={dueLocal} onChange={(e) => setDueLocal(e.target.value)} />
      </div>
      <SelectField
        label="Who should do it"
        error={formState.errors.responsibleRole?.message}
        options={ROLES.map((r) => ({ value: r, label: `Any ${ROLE_LABELS[r].toLowerCase()}` }))}
        {...register('responsibleRole')}
      />
      <SelectField
        label="Name a person (optional)"
        error={formState.errors.assigneeId?.message}
        options={[{ value: '', label: 'No one in particular' }, ...people.map((p) => ({ value: p.userId, label: `${p.name} (${ROLE_LABELS[p.role]})` }))]}
        {...register('assigneeId', { setValueAs: (v) => (v ? v : null) })}
      />
      <fieldset className="space-y-2">
        <legend className="text-sm font-semibold text-steel-800">Safety</legend>
        <label className="flex min-h-touch items-center gap-3">
          <input type="checkbox" className="h-6 w-6" {...register('requiresLockout')} /> Needs lockout/tagout
        </label>
        <label className="flex min-h-touch items-center gap-3">
          <input type="checkbox" className="h-6 w-6" {...register('safetyCritical')} /> Safety work (past-due notices go to the safety officer)
        </label>
      </fieldset>
      <div className="md:col-span-2">
        <Button type="submit" busy={formState.isSubmitting}>
          Raise work order
        </Button>
      </div>
    </form>
  );
}
