import { PageTitle } from '../../components/layout/app-shell';
import { Notice } from '../../components/ui/notice';
import { useMe } from '../../features/auth/api/get-me';
import { getSafetySettingsQueryOptions, useSafetySettings } from '../../features/safety/api/get-safety-settings';
import { SafetySettingsForm } from '../../features/safety/components/settings-form';
import { queryClient } from '../../lib/query-client';
import { can } from '../../../shared/permissions';

export const loader = () => queryClient.ensureQueryData(getSafetySettingsQueryOptions()).catch(() => null);

export function Component() {
  const { data: me } = useMe();
  const q = useSafetySettings();
  if (!me) return null;
  if (!can(me.role, 'safety.settings.manage')) return <Notice tone="danger">Site safety settings are kept by the safety officer and the admin.</Notice>;
  if (q.isError) return <Notice tone="danger">{q.error.message}</Notice>;
  if (!q.data) return <p role="status">Loading…</p>;
  return (
    <>
      <PageTitle
        title="Site safety settings"
        subtitle="Reference values from standards, with their sources; change them where your local code says otherwise."
      />
      <SafetySettingsForm settings={q.data} />
    </>
  );
}
