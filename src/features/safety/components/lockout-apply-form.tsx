import { useEffect, useMemo, useState } from 'react';
import { useFieldArray, useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { useNavigate } from 'react-router-dom';
import type { z } from 'zod';
import { SelectField, TextField } from '../../../components/ui/field';
import { Button } from '../../../components/ui/button';
import { Notice, Panel, FormMessages } from '../../../components/ui/notice';
import { WorkCaution } from '../../../components/ui/caution';
import { applyServerErrors } from '../../../lib/form-errors';
import { paths } from '../../../config/paths';
import type { Role } from '../../../../shared/permissions';
import { applyLockoutFormSchema, lockoutReasonFromWork, LOCK_DEVICES, LOCK_DEVICE_LABELS, type LockDevice } from '../../../../shared/schemas/safety-lockout';
import { ENERGY_KIND_LABELS, PHASE_LABELS, PROCEDURE_PHASES, type EnergySource } from '../../../../shared/schemas/safety-procedures';
import { useSafetyMachines } from '../api/get-safety-machines';
import { useProcedure } from '../api/get-procedure';
import { useLockoutAuthorization } from '../api/get-lockout-authorization';
import { useApplyLockout } from '../api/apply-lockout';
import { useSignFlow } from './sign-dialog';
import { useLinkedWorkOrder } from '../api/get-linked-work-order';
import { TagOnlyReasonFields } from './tag-only-reason';
import { tagJustificationText } from '../../../../shared/schemas/safety-tag-only';

type FormIn = z.input<typeof applyLockoutFormSchema>;
type FormOut = z.output<typeof applyLockoutFormSchema>;

const defaultDevice = (s: EnergySource): LockDevice =>
  s.kind === 'gravity'
    ? 'blocking'
    : s.kind === 'thermal' || s.kind === 'stored-mechanical'
      ? 'tag-only'
      : s.kind === 'hydraulic'
        ? 'valve-cover'
        : 'lock-and-tag';

/** Record the locks as they go on: one row per isolation point the approved procedure names. */
export function LockoutApplyForm({
  signer,
  initialMachineId,
  workOrderId,
}: {
  signer: { name: string; role: Role };
  initialMachineId?: string;
  workOrderId?: string;
}) {
  const machines = useSafetyMachines();
  const [machineId, setMachineId] = useState(initialMachineId ?? '');
  const machine = machines.data?.find((m) => m.id === machineId);
  const approved = useMemo(() => (machine?.procedures ?? []).filter((p) => p.approvedVersion !== null), [machine]);
  const navigate = useNavigate();
  const apply = useApplyLockout();
  const { sign, dialog } = useSignFlow(signer);
  const wo = useLinkedWorkOrder(workOrderId);
  const [formError, setFormError] = useState<string | null>(null);
  const { register, control, handleSubmit, setError, watch, setValue, getValues, formState } = useForm<FormIn, unknown, FormOut>({
    resolver: zodResolver(applyLockoutFormSchema),
    defaultValues: { procedureId: '', reason: '', group: false, points: [], workOrderId },
  });
  const { fields, replace } = useFieldArray({ control, name: 'points' });
  const procedureId = watch('procedureId');
  const points = watch('points');
  const procedure = useProcedure(procedureId ?? '');
  const authorization = useLockoutAuthorization(procedureId ?? '');
  const content = procedureId ? procedure.data?.current?.content : undefined;

  useEffect(() => {
    if (approved.length && !approved.some((p) => p.id === procedureId)) setValue('procedureId', approved[0].id);
    if (!approved.length && procedureId) setValue('procedureId', '');
  }, [approved, procedureId, setValue]);
  // Applied from a work order: the work to be done is that work, unless the person has typed their own words already.
  const linked = wo.data;
  useEffect(() => {
    if (linked && !getValues('reason')?.trim()) setValue('reason', lockoutReasonFromWork(linked));
  }, [linked, getValues, setValue]);
  useEffect(() => {
    replace(content ? content.sources.map((s) => ({ sourceKey: s.key, device: defaultDevice(s), lockNumber: '', tagNumber: '' })) : []);
  }, [content, replace]);

  const onSubmit = handleSubmit((values) => {
    setFormError(null);
    sign(
      'lockout-applied',
      async (password) => {
        const r = await apply.mutateAsync({ ...values, workOrderId: values.workOrderId || undefined, password });
        navigate(paths.safetyLockout.getHref(r.id));
      },
      {
        onError: (err) =>
          setFormError(
            applyServerErrors(err, setError, [
              'procedureId',
              'reason',
              'workOrderId',
              'points',
              ...values.points.flatMap((_, i) => [
                `points.${i}.lockNumber`,
                `points.${i}.sourceKey`,
                `points.${i}.tagNumber`,
                `points.${i}.tagJustification`,
                `points.${i}.tagMeasure`,
              ]),
            ]),
          ),
        detail: (
          <ul className="list-disc pl-5">
            {values.points.map((p) => (
              <li key={p.sourceKey}>
                {p.sourceKey}: {LOCK_DEVICE_LABELS[p.device].toLowerCase()} {p.lockNumber}
                {p.tagNumber ? ` / tag ${p.tagNumber}` : ''}
                {p.device === 'tag-only' ? ` — ${tagJustificationText(p.tagJustification, p.tagMeasure)}` : ''}
              </li>
            ))}
          </ul>
        ),
      },
    );
  });

  return (
    <>
      <form onSubmit={onSubmit} noValidate aria-label="Apply a lockout" className="space-y-4">
        <FormMessages error={formError} />
        <WorkCaution />
        <Panel title="1. Machine and procedure">
          <div className="grid gap-4 md:grid-cols-2">
            <SelectField
              label="Machine"
              value={machineId}
              onChange={(e) => setMachineId(e.target.value)}
              options={[
                { value: '', label: machines.isLoading ? 'Loading…' : 'Choose a machine' },
                ...(machines.data ?? []).map((m) => ({ value: m.id, label: `${m.code} · ${m.name}` })),
              ]}
            />
            <SelectField
              label="Energy-control procedure"
              error={formState.errors.procedureId?.message}
              disabled={!approved.length}
              options={
                approved.length
                  ? approved.map((p) => ({ value: p.id, label: `${p.title} (version ${p.approvedVersion})` }))
                  : [{ value: '', label: machine ? 'No approved procedure for this machine' : 'Choose a machine first' }]
              }
              {...register('procedureId')}
            />
            <TextField
              label="Work to be done"
              hint="What the lockout protects, e.g. “Replace the punch station clamp”."
              error={formState.errors.reason?.message}
              {...register('reason')}
            />
            <label className="flex min-h-touch items-center gap-3 self-end rounded border border-steel-300 bg-white px-3">
              <input type="checkbox" className="h-6 w-6" {...register('group')} />
              <span>
                <strong>Group lockout</strong> — others will add their personal locks
              </span>
            </label>
            {workOrderId ? (
              <p className="text-sm text-steel-700 md:col-span-2">
                For {wo.data ? `WO ${wo.data.number} “${wo.data.title}”` : 'the work order you came from'}: it can be signed off only after this lockout is
                released.
              </p>
            ) : null}
          </div>
          {procedureId && authorization.data && !authorization.data.authorized ? (
            <div className="mt-3">
              <Notice tone="caution" title="You are not authorized on this procedure">
                {authorization.data.reason}. Signing will be refused and recorded; ask the safety officer about training.
                {authorization.data.minorTasks.length ? ` You are trained for its minor-servicing tasks: ${authorization.data.minorTasks.join(', ')}.` : ''}
              </Notice>
            </div>
          ) : null}
          {machine && !approved.length ? (
            <div className="mt-3">
              <Notice tone="danger" title="Stop: no approved procedure">
                This machine has no approved energy-control procedure. Do not lock it out from memory; ask the safety officer.
              </Notice>
            </div>
          ) : null}
        </Panel>

        {content ? (
          <>
            <Panel title="2. Follow the procedure">
              <ol className="space-y-2">
                {PROCEDURE_PHASES.slice(0, 5).map((phase, i) => (
                  <li key={phase}>
                    <p className="font-semibold">
                      {i + 1}. {PHASE_LABELS[phase].title} <span className="text-sm font-normal text-steel-600">({PHASE_LABELS[phase].source})</span>
                    </p>
                    <ul className="list-disc pl-6 text-steel-800">
                      {content.steps[phase].map((s, j) => (
                        <li key={j}>{s}</li>
                      ))}
                    </ul>
                  </li>
                ))}
              </ol>
            </Panel>
            <Panel title="3. Your locks and tags on each isolation point">
              {formState.errors.points?.message ? (
                <p role="alert" className="mb-2 font-semibold text-danger">
                  {formState.errors.points.message}
                </p>
              ) : null}
              <div className="space-y-3">
                {fields.map((f, i) => {
                  const s = content.sources.find((x) => x.key === f.sourceKey);
                  const err = formState.errors.points?.[i];
                  const point = points?.[i];
                  return (
                    <fieldset key={f.id} className="grid gap-3 rounded border border-steel-300 bg-steel-50 p-3 md:grid-cols-[5rem_1fr_12rem_10rem_9rem]">
                      <legend className="sr-only">Isolation point {f.sourceKey}</legend>
                      <span
                        className="flex h-14 min-w-14 justify-self-start items-center justify-center rounded-full bg-caution px-2 text-lg font-bold text-steel-950"
                        aria-hidden
                      >
                        {f.sourceKey}
                      </span>
                      <div className="text-sm">
                        <p className="font-bold">
                          {f.sourceKey} · {s ? ENERGY_KIND_LABELS[s.kind] : ''}
                        </p>
                        <p>
                          {s?.isolationDevice} — {s?.location}
                        </p>
                        <p className="text-steel-600">{s?.magnitude}</p>
                      </div>
                      <SelectField
                        label={`Device on ${f.sourceKey}`}
                        options={LOCK_DEVICES.map((d) => ({ value: d, label: LOCK_DEVICE_LABELS[d] }))}
                        {...register(`points.${i}.device`)}
                      />
                      <TextField
                        label={`Lock or tag no. on ${f.sourceKey}`}
                        autoComplete="off"
                        error={err?.lockNumber?.message}
                        {...register(`points.${i}.lockNumber`)}
                      />
                      <TextField label={`Tag no. (optional)`} autoComplete="off" error={err?.tagNumber?.message} {...register(`points.${i}.tagNumber`)} />
                      {point?.device === 'tag-only' ? (
                        <TagOnlyReasonFields index={i} sourceKey={f.sourceKey} basis={point.tagJustification} register={register} errors={formState.errors} />
                      ) : null}
                    </fieldset>
                  );
                })}
              </div>
            </Panel>
            <div className="flex justify-end">
              <Button type="submit" variant="danger" className="min-w-64">
                Sign: my locks are on
              </Button>
            </div>
          </>
        ) : null}
      </form>
      {dialog}
    </>
  );
}
