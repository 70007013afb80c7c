import { Link, useNavigate, useParams, type LoaderFunctionArgs } from 'react-router-dom';
import { PageTitle } from '../../components/layout/app-shell';
import { Notice } from '../../components/ui/notice';
import { useMe } from '../../features/auth/api/get-me';
import { PreUseCheckForm } from '../../features/safety/components/pre-use-check';
import { getPreUseCheckQueryOptions } from '../../features/safety/api/get-pre-use-check';
import { queryClient } from '../../lib/query-client';
import { useShopFormat } from '../../lib/format';
import { paths } from '../../config/paths';
import { can } from '../../../shared/permissions';
import type { PreUseCheckResult } from '../../../shared/schemas/pre-use-checks';
import type { StationNotice } from './station';

export const loader = ({ params }: LoaderFunctionArgs) => queryClient.ensureQueryData(getPreUseCheckQueryOptions(params.code!)).catch(() => null);

/** What the station says once the check is signed. */
function noticeOf(r: PreUseCheckResult, time: string): StationNotice {
  const failed = r.lines.filter((l) => !l.ok).map((l) => l.label);
  const wo = r.workOrderNumber ? ` Repair raised: WO ${r.workOrderNumber}.` : '';
  if (r.pass) return { tone: 'safe', title: 'Pre-use check signed ✓', text: `${r.machineCode}: every line OK, signed by ${r.checkedBy} at ${time}.` };
  if (r.safetyCriticalFailed)
    return { tone: 'danger', title: `${r.machineCode} is out of service`, text: `Pre-use check failed: ${failed.join('; ')}. Do not run it.${wo}` };
  return { tone: 'caution', title: 'Pre-use check signed, not all OK', text: `${failed.join('; ')} not OK; the machine stays in service.${wo}` };
}

/** The pre-use check, opened from the station of the machine; signing returns to the station. */
export function Component() {
  const { code } = useParams();
  const { data: me } = useMe();
  const f = useShopFormat();
  const navigate = useNavigate();
  if (!me) return null;
  const back = paths.station.getHref(code!);
  return (
    <>
      <PageTitle
        title={`Pre-use check · ${code!.toUpperCase()}`}
        subtitle="Start of the shift: answer each line at the machine, then sign."
        actions={
          <Link to={back} className="inline-flex min-h-touch items-center rounded border border-steel-400 bg-white px-4 font-semibold">
            Back to the station
          </Link>
        }
      />
      {can(me.role, 'machines.pre-use.sign') ? (
        <PreUseCheckForm
          code={code!}
          me={{ name: me.user.name, role: me.role }}
          onSigned={(r) => navigate(back, { state: { notice: noticeOf(r, f.time(r.checkedAt)) } satisfies { notice: StationNotice } })}
        />
      ) : (
        <Notice>Pre-use checks are signed by the people who run the machines.</Notice>
      )}
    </>
  );
}
