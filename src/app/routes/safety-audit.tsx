import { PageTitle } from '../../components/layout/app-shell';
import { Notice } from '../../components/ui/notice';
import { useMe } from '../../features/auth/api/get-me';
import { ChainCheck, Compliance, SignOffAudit } from '../../features/safety/components/safety-audit';
import { can } from '../../../shared/permissions';

export function Component() {
  const { data: me } = useMe();
  if (!me) return null;
  if (!can(me.role, 'safety.audit')) return <Notice tone="danger">The safety audit is for the safety officer and the admin.</Notice>;
  return (
    <>
      <PageTitle title="Safety audit" subtitle="Who signed what and when, per machine; whether anything was changed afterwards; evidence to export." />
      <ChainCheck />
      <Compliance />
      <SignOffAudit me={{ name: me.user.name, role: me.role }} />
    </>
  );
}
