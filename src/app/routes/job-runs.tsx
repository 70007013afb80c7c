import { PageTitle } from '../../components/layout/app-shell';
import { Panel } from '../../components/ui/notice';
import { useMe } from '../../features/auth/api/get-me';
import { JobRuns } from '../../features/job-runs/components/job-runs-table';

export function Component() {
  const { data: me } = useMe();
  if (!me) return null;
  return (
    <>
      <PageTitle title="Pass log" subtitle="Each run of the scheduled job: plans checked, work raised, past-due work reported, mails queued, problems." />
      <Panel>
        <JobRuns />
      </Panel>
    </>
  );
}
