import { PageTitle } from '../../components/layout/app-shell';
import { Notice } from '../../components/ui/notice';
import { Inbox } from '../../features/dev-inbox/components/inbox';

export function Component() {
  return (
    <>
      <PageTitle title="Dev inbox" subtitle="E-mail caught by the local test mail server. Admins see every message; others see their own." />
      <Notice tone="info">Development and demo only: in production, mail goes to the configured SMTP relay and this page is empty.</Notice>
      <Inbox />
    </>
  );
}
