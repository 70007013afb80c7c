import { useState } from 'react';
import { createColumnHelper } from '@tanstack/react-table';
import { DataTable } from '../../../components/ui/data-table';
import { FilterSearch, FilterSelect, useServerTable } from '../../../components/ui/data-table-filters';
import { Badge, EmptyState, Notice } from '../../../components/ui/notice';
import { Button } from '../../../components/ui/button';
import { ConfirmDialog } from '../../../components/ui/confirm-dialog';
import { ROLES, ROLE_LABELS, type Role } from '../../../../shared/permissions';
import type { ListUsersQuery, MemberRow } from '../../../../shared/schemas/users';
import { useUsers } from '../api/get-users';
import { useResendInvitation, useUpdateMember } from '../api/update-member';
import { useShopFormat } from '../../../lib/format';

const col = createColumnHelper<MemberRow>();
const statusTone = { active: 'safe', invited: 'caution', deactivated: 'info' } as const;

export function UsersTable({ currentUserId }: { currentUserId: string }) {
  const f = useShopFormat();
  const t = useServerTable([{ id: 'name', desc: false }], { q: '', role: '' as Role | '', status: '' as NonNullable<ListUsersQuery['status']> | '' });
  const { q, role, status } = t.filters;
  const [pending, setPending] = useState<{ row: MemberRow; active: boolean } | null>(null);
  const [pendingRole, setPendingRole] = useState<{ row: MemberRow; role: Role } | null>(null);
  const [message, setMessage] = useState<{ tone: 'danger' | 'safe'; text: string } | null>(null);
  const update = useUpdateMember();
  const resend = useResendInvitation();
  const pageSize = 25;
  const sort = (t.sorting[0]?.id ?? 'name') as ListUsersQuery['sort'];
  const users = useUsers({
    page: t.page,
    pageSize,
    q: t.queryFilters.q || undefined,
    role: role || undefined,
    status: status || undefined,
    sort,
    dir: t.sorting[0]?.desc ? 'desc' : 'asc',
  });

  const changeRole = async (row: MemberRow, next: Role) => {
    setMessage(null);
    try {
      await update.mutateAsync({ id: row.membershipId, role: next });
      setMessage({ tone: 'safe', text: `${row.name} is now ${ROLE_LABELS[next]}.` });
    } catch (err) {
      setMessage({ tone: 'danger', text: err instanceof Error ? err.message : 'Could not change the role' });
    }
  };

  const columns = [
    col.accessor('name', { header: 'Name', enableHiding: false }),
    col.accessor('email', { header: 'E-mail' }),
    col.accessor('role', {
      header: 'Role',
      cell: (c) => {
        const row = c.row.original;
        if (row.userId === currentUserId) return ROLE_LABELS[row.role];
        return (
          <select
            aria-label={`Role of ${row.name}`}
            className="min-h-touch rounded border border-steel-400 bg-white px-2"
            value={row.role}
            disabled={update.isPending}
            onChange={(e) => setPendingRole({ row, role: e.target.value as Role })}
          >
            {ROLES.map((r) => (
              <option key={r} value={r}>
                {ROLE_LABELS[r]}
              </option>
            ))}
          </select>
        );
      },
    }),
    col.accessor('status', { header: 'Status', cell: (c) => <Badge tone={statusTone[c.getValue()]}>{c.getValue()}</Badge> }),
    col.accessor('lastSignInAt', { header: 'Last sign-in', cell: (c) => f.dateTime(c.getValue()) }),
    col.display({
      id: 'actions',
      header: 'Access',
      cell: (c) => {
        const row = c.row.original;
        if (row.userId === currentUserId) return <span className="text-steel-500">You</span>;
        const active = row.status !== 'deactivated';
        return (
          <div className="flex flex-wrap gap-2">
            {row.status === 'invited' ? (
              <Button
                variant="secondary"
                disabled={resend.isPending}
                aria-label={`Resend the invitation to ${row.name}`}
                onClick={async () => {
                  setMessage(null);
                  try {
                    await resend.mutateAsync(row.membershipId);
                    setMessage({ tone: 'safe', text: `A new invitation is on its way to ${row.email}; the earlier link no longer works.` });
                  } catch (err) {
                    setMessage({ tone: 'danger', text: err instanceof Error ? err.message : 'Could not resend the invitation' });
                  }
                }}
              >
                Resend invitation
              </Button>
            ) : null}
            <Button variant={active ? 'secondary' : 'ghost'} onClick={() => setPending({ row, active: !active })}>
              {active ? (row.status === 'invited' ? 'Withdraw invitation' : 'Deactivate') : 'Reactivate'}
            </Button>
          </div>
        );
      },
    }),
  ];

  return (
    <div className="space-y-3">
      {message ? (
        <Notice tone={message.tone} role="status">
          {message.text}
        </Notice>
      ) : null}
      {users.isError ? <Notice tone="danger">{users.error.message}</Notice> : null}
      <DataTable
        caption="People in this shop"
        columns={columns}
        data={users.data?.rows ?? []}
        loading={users.isLoading}
        fetching={users.isFetching}
        resultKey={t.resultKey}
        countLabel={(n) => `${n} ${n === 1 ? 'person matches' : 'people match'}`}
        getRowId={(r) => r.membershipId}
        empty={<EmptyState title="Nobody matches these filters" />}
        server={t.paging(users.data?.total ?? 0, pageSize)}
        toolbar={
          <>
            <FilterSearch value={q} placeholder="Name or e-mail" onChange={(v) => t.setFilter('q', v)} />
            <FilterSelect label="Role" value={role} onChange={(v) => t.setFilter('role', v as Role | '')}>
              <option value="">All roles</option>
              {ROLES.map((r) => (
                <option key={r} value={r}>
                  {ROLE_LABELS[r]}
                </option>
              ))}
            </FilterSelect>
            <FilterSelect label="Status" value={status} onChange={(v) => t.setFilter('status', v as NonNullable<ListUsersQuery['status']> | '')}>
              <option value="">Any status</option>
              <option value="active">Active</option>
              <option value="invited">Invited</option>
              <option value="deactivated">Deactivated</option>
            </FilterSelect>
          </>
        }
      />
      <ConfirmDialog
        open={pendingRole !== null}
        title={`Make ${pendingRole?.row.name} ${pendingRole ? ROLE_LABELS[pendingRole.role] : ''}?`}
        confirmLabel="Change role"
        busy={update.isPending}
        onCancel={() => setPendingRole(null)}
        onConfirm={async () => {
          if (pendingRole) await changeRole(pendingRole.row, pendingRole.role);
          setPendingRole(null);
        }}
      >
        {pendingRole?.role === 'admin'
          ? 'Admins manage people, machines, plans and site settings. The change applies at their next click.'
          : 'What they can see and do changes at their next click. You can change it back at any time.'}
      </ConfirmDialog>
      <ConfirmDialog
        open={pending !== null}
        title={
          pending?.active
            ? `Reactivate ${pending?.row.name}?`
            : pending?.row.status === 'invited'
              ? `Withdraw the invitation to ${pending?.row.name}?`
              : `Deactivate ${pending?.row.name}?`
        }
        confirmLabel={pending?.active ? 'Reactivate' : pending?.row.status === 'invited' ? 'Withdraw invitation' : 'Deactivate'}
        tone={pending?.active ? 'primary' : 'danger'}
        busy={update.isPending}
        onCancel={() => setPending(null)}
        onConfirm={async () => {
          if (!pending) return;
          try {
            await update.mutateAsync({ id: pending.row.membershipId, active: pending.active });
            setMessage({ tone: 'safe', text: `${pending.row.name} ${pending.active ? 'can sign in again' : 'can no longer sign in'}.` });
          } catch (err) {
            setMessage({ tone: 'danger', text: err instanceof Error ? err.message : 'Could not change access' });
          }
          setPending(null);
        }}
      >
        {pending?.active
          ? pending.row.status === 'invited'
            ? 'Then send them a new invitation: the earlier link stopped working when it was withdrawn.'
            : 'They will be able to sign in again with their password.'
          : pending?.row.status === 'invited'
            ? 'The link in their invitation mail stops working. You can reactivate them and resend it later.'
            : 'They are signed out at once and cannot sign in. Their records and signatures stay in the log. You can reactivate them later.'}
      </ConfirmDialog>
    </div>
  );
}
