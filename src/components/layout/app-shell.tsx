import { useState, type ReactNode } from 'react';
import { NavLink, useLocation } from 'react-router-dom';

/** A menu entry; with `children` it stands for a group whose pages show as tabs on each of them. */
export type NavItem = { to: string; label: string; end?: boolean; personal?: boolean; children?: NavItem[] };

const onPage = (pathname: string, item: NavItem) => pathname === item.to || (!item.end && pathname.startsWith(`${item.to}/`));

/** The frame around every signed-in page: top bar, navigation, content. */
export function AppShell({
  shopName,
  userName,
  roleLabel,
  nav,
  onSignOut,
  signingOut,
  children,
}: {
  shopName: string;
  userName: string;
  roleLabel: string;
  nav: NavItem[];
  onSignOut: () => void;
  signingOut?: boolean;
  children: ReactNode;
}) {
  const [menuOpen, setMenuOpen] = useState(false);
  const { pathname } = useLocation();
  const linkClass = (isActive: boolean, personal?: boolean) =>
    `flex min-h-touch items-center rounded px-3 font-semibold ${personal ? 'text-sm' : 'text-base'} ${isActive ? 'bg-white text-steel-900' : 'text-steel-100 hover:bg-steel-700'}`;
  const group = nav.find((i) => i.children?.some((c) => onPage(pathname, c)));
  const firstPersonal = nav.findIndex((i) => i.personal);
  return (
    <div className="min-h-screen">
      <a href="#main" className="sr-only focus:not-sr-only focus:absolute focus:left-2 focus:top-2 focus:z-50 focus:bg-white focus:p-2">
        Skip to content
      </a>
      <header className="no-print border-b-4 border-caution bg-steel-900 text-white">
        <div className="mx-auto flex max-w-7xl items-center gap-3 px-3 py-2">
          <img src="/favicon.svg" alt="" className="h-8 w-8" />
          <div className="mr-auto leading-tight">
            <p className="text-lg font-bold tracking-wide">Kerfbook</p>
            <p className="text-xs text-steel-300">{shopName}</p>
          </div>
          <div className="hidden text-right text-sm leading-tight sm:block">
            <p className="font-semibold">{userName}</p>
            <p className="text-steel-300">{roleLabel}</p>
          </div>
          <button
            type="button"
            onClick={onSignOut}
            disabled={signingOut}
            className="min-h-touch rounded border border-steel-500 px-3 text-sm font-semibold hover:bg-steel-700"
          >
            Sign out
          </button>
          <button
            type="button"
            className="min-h-touch min-w-touch rounded border border-steel-500 md:hidden"
            aria-expanded={menuOpen}
            aria-controls="main-nav"
            onClick={() => setMenuOpen((o) => !o)}
          >
            <span className="sr-only">Menu</span>
            <span aria-hidden>☰</span>
          </button>
        </div>
        <nav id="main-nav" aria-label="Main" className={`${menuOpen ? 'block' : 'hidden'} bg-steel-800 md:block`}>
          <ul className="mx-auto flex max-w-7xl flex-col gap-1 px-3 py-2 md:flex-row md:flex-wrap">
            {nav.map((item, index) => (
              <li key={item.to} className={index === firstPersonal ? 'md:ml-auto' : undefined}>
                {item.children ? (
                  <NavLink to={item.to} className={() => linkClass(group === item)} onClick={() => setMenuOpen(false)}>
                    {item.label}
                  </NavLink>
                ) : (
                  <NavLink to={item.to} end={item.end} className={({ isActive }) => linkClass(isActive, item.personal)} onClick={() => setMenuOpen(false)}>
                    {item.label}
                  </NavLink>
                )}
              </li>
            ))}
          </ul>
        </nav>
      </header>
      <main id="main" className="mx-auto max-w-7xl space-y-4 px-3 py-4 md:px-6">
        {group?.children ? (
          <nav aria-label={group.label} className="no-print -mb-1 border-b-2 border-steel-300">
            <ul className="flex flex-wrap gap-1">
              {group.children.map((c) => (
                <li key={c.to}>
                  <NavLink
                    to={c.to}
                    end={c.end}
                    className={({ isActive }) =>
                      `-mb-0.5 flex min-h-touch items-center border-b-4 px-3 font-semibold ${isActive ? 'border-caution text-steel-900' : 'border-transparent text-steel-600 hover:text-steel-900'}`
                    }
                  >
                    {c.label}
                  </NavLink>
                </li>
              ))}
            </ul>
          </nav>
        ) : null}
        {children}
      </main>
    </div>
  );
}

export function PageTitle({ title, subtitle, actions }: { title: string; subtitle?: string; actions?: ReactNode }) {
  return (
    <div className="flex flex-wrap items-end justify-between gap-3">
      <div>
        <h1 className="text-2xl font-bold text-steel-900 md:text-3xl">{title}</h1>
        {subtitle ? <p className="text-steel-600">{subtitle}</p> : null}
      </div>
      {actions}
    </div>
  );
}
