import { Link, useNavigate, useSearchParams } from 'react-router-dom';
import { PageTitle } from '../../components/layout/app-shell';
import { useMe } from '../../features/auth/api/get-me';
import { PpeStation } from '../../features/safety/components/ppe-station';
import type { PpeSignedState } from '../../features/station/components/ppe-check-link';
import { queryClient } from '../../lib/query-client';
import { getPpeRequirementsQueryOptions } from '../../features/safety/api/get-ppe-requirements';
import { paths } from '../../config/paths';
import { can } from '../../../shared/permissions';
import { Notice } from '../../components/ui/notice';

export const loader = () => queryClient.ensureQueryData(getPpeRequirementsQueryOptions()).catch(() => null);

export function Component() {
  const { data: me } = useMe();
  const [params] = useSearchParams();
  const navigate = useNavigate();
  // Only a station page is a place to return to: the address cannot send anyone elsewhere.
  const back = /^\/station\/[^/?#]+$/.test(params.get('back') ?? '') ? params.get('back')! : null;
  if (!me) return null;
  return (
    <>
      <PageTitle
        title="PPE check"
        subtitle="Before your shift at the machine: tap each item when it is on, then sign."
        actions={
          can(me.role, 'safety.ppe.manage') ? (
            <Link className="font-semibold underline" to={paths.safetyPpeRequirements.getHref()}>
              Set PPE requirements
            </Link>
          ) : null
        }
      />
      {can(me.role, 'safety.ppe.sign') ? (
        <PpeStation
          me={{ name: me.user.name, role: me.role }}
          initialMachineId={params.get('machineId') ?? undefined}
          onSigned={back ? (signed) => navigate(back, { state: { ppeSigned: signed } satisfies PpeSignedState }) : undefined}
        />
      ) : (
        <Notice tone="info">PPE checks are signed by the people who work at the machines.</Notice>
      )}
    </>
  );
}
