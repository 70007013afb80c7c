import { useEffect, useRef, useState } from 'react';
import { useSearchParams } from 'react-router-dom';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { createColumnHelper } from '@tanstack/react-table';
import type { z } from 'zod';
import { DataTable } from '../../../components/ui/data-table';
import { Button } from '../../../components/ui/button';
import { SelectField, TextField } from '../../../components/ui/field';
import { Badge, EmptyState, Notice, Panel, FormMessages } from '../../../components/ui/notice';
import { ApiError } from '../../../lib/api-client';
import { applyServerErrors } from '../../../lib/form-errors';
import { can, ROLE_LABELS, type Role } from '../../../../shared/permissions';
import {
  inspectionSchema,
  TRAINING_KIND_LABELS,
  TRAINING_KINDS,
  trainingSchema,
  type InspectionRow,
  type TrainingKind,
  type TrainingRow,
} from '../../../../shared/schemas/safety-records';
import { useInspections } from '../api/get-inspections';
import { useRecordInspection } from '../api/record-inspection';
import { useCertifyInspection } from '../api/certify-inspection';
import { useTraining } from '../api/get-training';
import { useRecordTraining } from '../api/record-training';
import { useProcedures } from '../api/get-procedures';
import { useSafetyPeople } from '../api/get-safety-people';
import { useSignFlow } from './sign-dialog';
import { DueBadge } from './badges';
import { useShopFormat } from '../../../lib/format';

type Me = { id: string; name: string; role: Role };
const inspectionForm = inspectionSchema.omit({ password: true });
const trainingForm = trainingSchema.omit({ password: true });
const area = 'block min-h-20 w-full rounded border border-steel-400 bg-white px-3 py-2';

function InspectionForm({ me, onDone, procedureId }: { me: Me; onDone: (m: string) => void; procedureId?: string }) {
  const f = useShopFormat();
  const procedures = useProcedures();
  const people = useSafetyPeople();
  const record = useRecordInspection();
  const { sign, dialog } = useSignFlow(me);
  const [formError, setFormError] = useState<string | null>(null);
  const { register, handleSubmit, setError, reset, formState, setValue } = useForm<z.input<typeof inspectionForm>, unknown, z.output<typeof inspectionForm>>({
    resolver: zodResolver(inspectionForm),
    defaultValues: { procedureId: '', inspectedOn: f.today(), employeeIds: [], findings: '', deviations: '' },
  });
  // Opened from a due task: choose its procedure once the options exist.
  useEffect(() => {
    if (procedureId && procedures.data) setValue('procedureId', procedureId);
  }, [procedureId, procedures.data, setValue]);
  const e = formState.errors;
  const submit = handleSubmit((v) =>
    sign(
      'inspection-performed',
      async (password) => {
        setFormError(null);
        await record.mutateAsync({ ...v, password });
        reset();
        onDone('Inspection recorded. The safety officer certifies it next.');
      },
      {
        onError: (err) =>
          setFormError(applyServerErrors(err, setError, ['procedureId', 'inspectedOn', 'employeeIds', 'findings', 'deviations', 'responsibilitiesReviewed'])),
      },
    ),
  );
  return (
    <>
      <form onSubmit={submit} noValidate aria-label="Record a periodic inspection" className="space-y-3">
        <FormMessages error={formError} />
        <p className="text-sm text-steel-700">
          You are the inspector. OSHA 29 CFR 1910.147(c)(6)(i)(A): the inspector is an authorized employee other than the ones using the procedure, so do not
          include yourself.
        </p>
        <div className="grid gap-3 md:grid-cols-2">
          <SelectField
            label="Procedure"
            error={e.procedureId?.message}
            options={[
              { value: '', label: 'Choose a procedure' },
              ...(procedures.data ?? [])
                .filter((p) => p.currentVersion)
                .map((p) => ({ value: p.id, label: `${p.machineCode} · ${p.title} (v${p.currentVersion})` })),
            ]}
            {...register('procedureId')}
          />
          <TextField label="Inspected on" type="date" error={e.inspectedOn?.message} {...register('inspectedOn')} />
        </div>
        <fieldset>
          <legend className="text-sm font-semibold">Employees using the procedure, watched in this inspection</legend>
          <div className="mt-1 grid gap-2 md:grid-cols-2">
            {(people.data ?? [])
              .filter((p) => p.id !== me.id)
              .map((p) => (
                <label key={p.id} className="flex min-h-touch items-center gap-3 rounded border border-steel-300 bg-white px-3">
                  <input type="checkbox" className="h-6 w-6" value={p.id} {...register('employeeIds')} />
                  {p.name} <span className="text-sm text-steel-600">({ROLE_LABELS[p.role]})</span>
                </label>
              ))}
          </div>
          {e.employeeIds?.message ? (
            <p role="alert" className="text-sm font-semibold text-danger">
              {e.employeeIds.message}
            </p>
          ) : null}
        </fieldset>
        <div className="space-y-1">
          <label htmlFor="ins-findings" className="block text-sm font-semibold">
            What you saw
          </label>
          <textarea id="ins-findings" className={area} {...register('findings')} />
          {e.findings?.message ? (
            <p role="alert" className="text-sm font-semibold text-danger">
              {e.findings.message}
            </p>
          ) : null}
        </div>
        <div className="space-y-1">
          <label htmlFor="ins-dev" className="block text-sm font-semibold">
            Deviations or inadequacies, and how they were corrected (optional)
          </label>
          <textarea id="ins-dev" className={area} {...register('deviations')} />
        </div>
        <label className="flex min-h-touch items-center gap-3">
          <input type="checkbox" className="h-6 w-6" {...register('responsibilitiesReviewed')} />
          <span>I reviewed each employee’s responsibilities under the procedure with them (1910.147(c)(6)(i)(C))</span>
        </label>
        {e.responsibilitiesReviewed?.message ? (
          <p role="alert" className="text-sm font-semibold text-danger">
            {e.responsibilitiesReviewed.message}
          </p>
        ) : null}
        <Button type="submit">Sign: inspection performed</Button>
      </form>
      {dialog}
    </>
  );
}

function TrainingForm({
  me,
  onDone,
  personId,
  procedureId,
  kind,
}: {
  me: Me;
  onDone: (m: string) => void;
  personId?: string;
  procedureId?: string;
  kind?: TrainingKind;
}) {
  const f = useShopFormat();
  const procedures = useProcedures();
  const people = useSafetyPeople();
  const record = useRecordTraining();
  const { sign, dialog } = useSignFlow(me);
  const [formError, setFormError] = useState<string | null>(null);
  const { register, handleSubmit, setError, formState, setValue } = useForm<z.input<typeof trainingForm>, unknown, z.output<typeof trainingForm>>({
    resolver: zodResolver(trainingForm),
    defaultValues: { userId: '', procedureId: '', kind: 'authorized', trainedOn: f.today(), note: '' },
  });
  // Opened from a due retraining task: choose the person and procedure once the options exist.
  useEffect(() => {
    if (personId && people.data) setValue('userId', personId);
    if (procedureId && procedures.data) setValue('procedureId', procedureId);
    if (kind) setValue('kind', kind);
  }, [personId, procedureId, kind, people.data, procedures.data, setValue]);
  const e = formState.errors;
  const submit = handleSubmit((v) =>
    sign(
      'training-recorded',
      async (password) => {
        setFormError(null);
        await record.mutateAsync({ ...v, password });
        onDone('Training recorded.');
      },
      { onError: (err) => setFormError(applyServerErrors(err, setError, ['userId', 'procedureId', 'kind', 'trainedOn', 'note'])) },
    ),
  );
  return (
    <>
      <form onSubmit={submit} noValidate aria-label="Record training" className="space-y-3">
        <FormMessages error={formError} />
        <div className="grid gap-3 md:grid-cols-2">
          <SelectField
            label="Person"
            error={e.userId?.message}
            options={[
              { value: '', label: 'Choose a person' },
              ...(people.data ?? []).map((p) => ({ value: p.id, label: `${p.name} (${ROLE_LABELS[p.role]})` })),
            ]}
            {...register('userId')}
          />
          <SelectField
            label="Procedure (its approved version)"
            error={e.procedureId?.message}
            options={[
              { value: '', label: 'Choose a procedure' },
              ...(procedures.data ?? [])
                .filter((p) => p.currentVersion)
                .map((p) => ({ value: p.id, label: `${p.machineCode} · ${p.title} (v${p.currentVersion})` })),
            ]}
            {...register('procedureId')}
          />
          <SelectField
            label="Kind of training"
            error={e.kind?.message}
            options={TRAINING_KINDS.map((k) => ({ value: k, label: TRAINING_KIND_LABELS[k] }))}
            {...register('kind')}
          />
          <TextField label="Trained on" type="date" error={e.trainedOn?.message} {...register('trainedOn')} />
          <TextField label="Note (optional)" error={e.note?.message} {...register('note')} />
        </div>
        <Button type="submit">Sign: training recorded</Button>
      </form>
      {dialog}
    </>
  );
}

const insCol = createColumnHelper<InspectionRow>();
const trCol = createColumnHelper<TrainingRow>();

export function SafetyRecords({ me }: { me: Me }) {
  const f = useShopFormat();
  const inspections = useInspections();
  const training = useTraining();
  const certify = useCertifyInspection();
  const { sign, dialog } = useSignFlow(me);
  const [message, setMessage] = useState<{ tone: 'safe' | 'danger'; text: string } | null>(null);
  const ok = (text: string) => setMessage({ tone: 'safe', text });
  // Links from "Safety work due" open the form where that work is recorded, prefilled.
  const [params] = useSearchParams();
  const inspect = params.get('inspect') ?? undefined;
  const trainPerson = params.get('train') ?? undefined;
  const trainProcedure = params.get('procedure') ?? undefined;
  const trainAs = TRAINING_KINDS.find((k) => k === params.get('as'));
  const inspectRef = useRef<HTMLDetailsElement>(null);
  const trainRef = useRef<HTMLDetailsElement>(null);
  useEffect(() => {
    const target = inspect ? inspectRef.current : trainPerson ? trainRef.current : null;
    if (!target) return;
    target.open = true;
    target.scrollIntoView({ block: 'start' });
  }, [inspect, trainPerson]);
  return (
    <div className="space-y-4">
      {message ? (
        <Notice tone={message.tone} role={message.tone === 'danger' ? 'alert' : 'status'}>
          {message.text}
        </Notice>
      ) : null}
      <Panel title="Periodic inspections (at least once a year, OSHA 29 CFR 1910.147(c)(6))">
        <DataTable
          caption="Periodic inspections"
          data={inspections.data ?? []}
          loading={inspections.isLoading}
          getRowId={(r) => r.id}
          empty={<EmptyState title="No inspections recorded yet" />}
          columns={[
            insCol.accessor('inspectedOn', { header: 'Date', cell: (c) => f.date(c.getValue() as string) }),
            insCol.accessor('machineCode', { header: 'Machine' }),
            insCol.accessor('procedureTitle', { header: 'Procedure', cell: (c) => `${c.getValue()} v${c.row.original.procedureVersion}` }),
            insCol.accessor('inspectorName', { header: 'Inspector' }),
            insCol.accessor((r) => r.employees.map((x) => x.name).join(', '), { id: 'employees', header: 'Employees' }),
            insCol.accessor('certifiedAt', {
              header: 'Certified',
              cell: (c) => {
                const r = c.row.original;
                if (r.certifiedAt)
                  return (
                    <span>
                      <Badge tone="safe">Certified</Badge> {f.dateTime(r.certifiedAt)} · {r.certifiedByName}
                    </span>
                  );
                if (!can(me.role, 'safety.inspection.certify')) return <Badge tone="caution">Waiting</Badge>;
                return (
                  <Button
                    variant="secondary"
                    onClick={() =>
                      sign(
                        'inspection-certified',
                        async (password) => {
                          await certify.mutateAsync({ id: r.id, password });
                          ok(`Inspection of ${r.machineCode} on ${f.date(r.inspectedOn)} certified.`);
                        },
                        { onError: (err) => setMessage({ tone: 'danger', text: err instanceof ApiError ? err.message : 'Could not certify' }) },
                      )
                    }
                  >
                    Certify
                  </Button>
                );
              },
            }),
          ]}
        />
        {can(me.role, 'safety.inspection.perform') ? (
          <details ref={inspectRef} id="record-inspection" className="mt-4 scroll-mt-4 rounded border border-steel-300 p-3">
            <summary className="flex min-h-touch cursor-pointer items-center font-semibold">Record an inspection I performed</summary>
            <InspectionForm me={me} onDone={ok} procedureId={inspect} />
          </details>
        ) : null}
      </Panel>
      <Panel title="Training (1910.147(c)(7)) — retraining when a procedure changes">
        <DataTable
          caption="Training records, people needing retraining first"
          data={training.data ?? []}
          loading={training.isLoading}
          getRowId={(r) => r.id}
          empty={<EmptyState title="No training recorded yet" />}
          columns={[
            trCol.accessor('status', { header: 'Status', cell: (c) => <DueBadge status={c.getValue() as TrainingRow['status']} /> }),
            trCol.accessor('personName', { header: 'Person' }),
            trCol.accessor('machineCode', { header: 'Machine' }),
            trCol.accessor('procedureTitle', { header: 'Procedure' }),
            trCol.accessor('kind', { header: 'As', cell: (c) => TRAINING_KIND_LABELS[c.getValue() as TrainingRow['kind']].split(' (')[0] }),
            trCol.accessor('trainedVersion', {
              header: 'Trained on',
              cell: (c) => `v${c.getValue()}${c.row.original.currentVersion ? ` (in force: v${c.row.original.currentVersion})` : ''}`,
            }),
            trCol.accessor('trainedOn', { header: 'Date', cell: (c) => f.date(c.getValue() as string) }),
            trCol.accessor('trainerName', { header: 'Trainer' }),
          ]}
        />
        {can(me.role, 'safety.training.manage') ? (
          <details ref={trainRef} id="record-training" className="mt-4 scroll-mt-4 rounded border border-steel-300 p-3">
            <summary className="flex min-h-touch cursor-pointer items-center font-semibold">Record training</summary>
            <TrainingForm me={me} onDone={ok} personId={trainPerson} procedureId={trainProcedure} kind={trainAs} />
          </details>
        ) : null}
      </Panel>
      {dialog}
    </div>
  );
}
