import { Outlet, useNavigate } from 'react-router-dom';
import { AppShell } from '../../components/layout/app-shell';
import { useMe } from '../../features/auth/api/get-me';
import { useLogout } from '../../features/auth/api/logout';
import { ROLE_LABELS } from '../../../shared/permissions';
import { navFor } from '../nav';
import { paths } from '../../config/paths';
import { ShopFormatProvider } from '../../lib/format';

export function Component() {
  const { data: me } = useMe();
  const logout = useLogout();
  const navigate = useNavigate();
  if (!me) return null; // the loader redirects before this happens
  return (
    <AppShell
      shopName={me.organization.name}
      userName={me.user.name}
      roleLabel={ROLE_LABELS[me.role]}
      nav={navFor(me.role)}
      signingOut={logout.isPending}
      onSignOut={() => logout.mutate(undefined, { onSettled: () => navigate(paths.signIn.getHref(), { replace: true }) })}
    >
      <ShopFormatProvider timeZone={me.organization.timeZone} locale={me.organization.locale}>
        <Outlet />
      </ShopFormatProvider>
    </AppShell>
  );
}
