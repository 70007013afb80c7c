import { useSearchParams } from 'react-router-dom';
import { PageTitle } from '../../components/layout/app-shell';
import { Notice } from '../../components/ui/notice';
import { useMe } from '../../features/auth/api/get-me';
import { LockoutApplyForm } from '../../features/safety/components/lockout-apply-form';
import { queryClient } from '../../lib/query-client';
import { getSafetyMachinesQueryOptions } from '../../features/safety/api/get-safety-machines';
import { can } from '../../../shared/permissions';

export const loader = () => queryClient.ensureQueryData(getSafetyMachinesQueryOptions()).catch(() => null);

export function Component() {
  const { data: me } = useMe();
  const [params] = useSearchParams();
  if (!me) return null;
  if (!can(me.role, 'safety.lockout.sign'))
    return <Notice tone="danger">Only authorized employees (technicians and the safety officer) apply lockouts.</Notice>;
  return (
    <>
      <PageTitle title="Lock out a machine" subtitle="Follow the approved procedure, put your own lock on every isolation point, then sign." />
      <LockoutApplyForm
        signer={{ name: me.user.name, role: me.role }}
        initialMachineId={params.get('machineId') ?? undefined}
        workOrderId={params.get('workOrderId') ?? undefined}
      />
    </>
  );
}
