import { PageTitle } from '../../components/layout/app-shell';
import { Notice } from '../../components/ui/notice';
import { Inbox } from '../../features/dev-inbox/components/inbox';
import { useMe } from '../../features/auth/api/get-me';

export function Component() {
  const { data: me } = useMe();
  if (!me) return null;
  return (
    <>
      <PageTitle
        title="Dev inbox"
        subtitle="E-mail caught by the local test mail server. Everyone sees the mail sent to them; admins also see what the shop sent its members, except password-reset links."
      />
      <Notice tone="info">Development and demo only: in production, mail goes to the configured SMTP relay and this page is empty.</Notice>
      <Inbox />
    </>
  );
}
