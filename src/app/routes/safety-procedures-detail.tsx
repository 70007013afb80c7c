import { useParams, useSearchParams, type LoaderFunctionArgs } from 'react-router-dom';
import { Breadcrumbs, PageTitle } from '../../components/layout/app-shell';
import { Notice } from '../../components/ui/notice';
import { useMe } from '../../features/auth/api/get-me';
import { getProcedureQueryOptions, useProcedure } from '../../features/safety/api/get-procedure';
import { ProcedureView } from '../../features/safety/components/procedure-view';
import { queryClient } from '../../lib/query-client';
import { paths } from '../../config/paths';

const versionOf = (s: string | null) => (s && /^\d+$/.test(s) ? Number(s) : undefined);

export const loader = ({ params, request }: LoaderFunctionArgs) =>
  queryClient.ensureQueryData(getProcedureQueryOptions(params.id!, versionOf(new URL(request.url).searchParams.get('version')))).catch(() => null);

export function Component() {
  const { id } = useParams();
  const [params] = useSearchParams();
  const version = versionOf(params.get('version'));
  const { data: me } = useMe();
  const q = useProcedure(id!, version);
  if (!me) return null;
  if (q.isError)
    return (
      <Notice tone="danger" role="alert">
        {q.error.message}
      </Notice>
    );
  if (!q.data) return <p role="status">Loading…</p>;
  const p = q.data;
  return (
    <>
      <Breadcrumbs
        trail={[
          { to: paths.safety.getHref(), label: 'Safety' },
          { to: paths.safetyProcedures.getHref(), label: 'Procedures' },
        ]}
        current={p.machine.code}
      />
      <PageTitle title={`${p.machine.code} · ${p.machine.name}`} subtitle={(p.current ?? p.draft)?.content.title} />
      <ProcedureView p={p} me={{ name: me.user.name, role: me.role }} viewingVersion={version} />
    </>
  );
}
