import { Link } from 'react-router-dom';
import { useMe } from '../../features/auth/api/get-me';
import { RoleHome } from '../../features/home/components/role-home';
import { ActivityLogTable } from '../../features/activity-log/components/activity-log-table';
import { Panel } from '../../components/ui/notice';
import { usePageTitle } from '../../components/layout/app-shell';
import { WorkCaution } from '../../components/ui/caution';
import { can } from '../../../shared/permissions';
import { paths } from '../../config/paths';
import { LowStockPanel } from '../../features/stock/components/low-stock-panel';
import { StationPicker } from '../../features/station/components/station-picker';
import { MyWorkPanel } from '../../features/work-orders/components/my-work-panel';
import { SafetyHomePanel } from '../../features/safety/components/safety-home-panel';

export function Component() {
  const { data: me } = useMe();
  usePageTitle('Today');
  if (!me) return null;
  return (
    <RoleHome role={me.role} name={me.user.name}>
      {/* At the machine the station is what an operator came for: first, above the fold on a phone. */}
      {me.role === 'operator' ? <StationPicker /> : null}
      <MyWorkPanel scope={me.role === 'admin' ? 'shop' : 'mine'} />
      <SafetyHomePanel role={me.role} />
      {me.role === 'operator' || me.role === 'technician' ? (
        <Panel title="Before you work on a machine">
          <WorkCaution />
        </Panel>
      ) : null}
      {can(me.role, 'stock.manage') ? <LowStockPanel /> : null}
      {can(me.role, 'consumables.log') && me.role !== 'operator' ? <StationPicker /> : null}
      {can(me.role, 'users.manage') ? (
        <Panel
          title="People"
          actions={
            <Link className="font-semibold text-mandatory underline" to={paths.users.getHref()}>
              Manage people
            </Link>
          }
        >
          <p className="text-steel-700">Invite operators, technicians and the safety officer; change roles; remove access for people who left.</p>
        </Panel>
      ) : null}
      {can(me.role, 'activity-log.read') ? (
        <Panel title="Latest activity" className="lg:col-span-2">
          <ActivityLogTable pageSize={5} filters={false} />
        </Panel>
      ) : null}
    </RoleHome>
  );
}
