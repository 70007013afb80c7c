import { PageTitle } from '../../components/layout/app-shell';
import { Panel } from '../../components/ui/notice';
import { InviteUserForm } from '../../features/users/components/invite-user-form';
import { UsersTable } from '../../features/users/components/users-table';
import { useMe } from '../../features/auth/api/get-me';

export function Component() {
  const { data: me } = useMe();
  if (!me) return null;
  return (
    <>
      <PageTitle title="People" subtitle="Invite people, give them a role, and take away access when they leave." />
      <Panel title="Invite someone">
        <InviteUserForm />
      </Panel>
      <Panel>
        <UsersTable currentUserId={me.user.id} />
      </Panel>
    </>
  );
}
