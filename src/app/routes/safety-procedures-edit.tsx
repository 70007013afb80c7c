import { useNavigate, useParams, useSearchParams } from 'react-router-dom';
import { PageTitle } from '../../components/layout/app-shell';
import { Notice } from '../../components/ui/notice';
import { useMe } from '../../features/auth/api/get-me';
import { useProcedure } from '../../features/safety/api/get-procedure';
import { useSafetyMachines } from '../../features/safety/api/get-safety-machines';
import { useCreateProcedure } from '../../features/safety/api/create-procedure';
import { useSaveDraft } from '../../features/safety/api/save-draft';
import { ProcedureForm } from '../../features/safety/components/procedure-form';
import { paths } from '../../config/paths';
import { can } from '../../../shared/permissions';

/** New procedure (no id) or the draft of an existing one. */
export function Component() {
  const { id } = useParams();
  const [params] = useSearchParams();
  const { data: me } = useMe();
  const navigate = useNavigate();
  const machines = useSafetyMachines();
  const existing = useProcedure(id ?? '');
  const create = useCreateProcedure();
  const save = useSaveDraft();
  if (!me) return null;
  if (!can(me.role, 'safety.procedures.draft')) return <Notice tone="danger">Only technicians and the safety officer write energy-control procedures.</Notice>;
  if (id && !existing.data)
    return existing.isError ? (
      <Notice tone="danger" role="alert">
        {existing.error.message}
      </Notice>
    ) : (
      <p role="status">Loading…</p>
    );
  if (!id && !machines.data) return <p role="status">Loading…</p>;
  const p = existing.data;
  const base = p?.draft?.content ?? p?.current?.content;
  const wanted = params.get('machineId');
  const options = (machines.data ?? []).map((m) => ({ id: m.id, code: m.code, label: `${m.code} · ${m.name}` }));
  return (
    <>
      <PageTitle
        title={p ? `Change the procedure for ${p.machine.code}` : 'Write an energy-control procedure'}
        subtitle={
          p
            ? p.draft
              ? `Editing draft version ${p.draft.version}.`
              : 'Saving starts a new draft version; the approved one stays in force until the new one is approved.'
            : 'Saved as draft version 1; it is in force only after you approve it.'
        }
      />
      <ProcedureForm
        key={p?.id ?? 'new'}
        initial={base}
        machines={wanted ? [...options.filter((o) => o.id === wanted), ...options.filter((o) => o.id !== wanted)] : options}
        fixedMachine={p ? { id: p.machine.id, code: p.machine.code, label: `${p.machine.code} · ${p.machine.name}` } : undefined}
        plant={machines.data}
        submitLabel={p ? 'Save draft' : 'Save as draft version 1'}
        onSubmit={async ({ machineId, content }) => {
          if (p) {
            await save.mutateAsync({ id: p.id, content });
            navigate(paths.safetyProcedure.getHref(p.id));
          } else {
            const r = await create.mutateAsync({ ...content, machineId });
            navigate(paths.safetyProcedure.getHref(r.id));
          }
        }}
      />
    </>
  );
}
