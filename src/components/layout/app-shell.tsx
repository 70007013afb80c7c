import { useEffect, useState, type ReactNode } from 'react';
import { Link, NavLink, useLocation } from 'react-router-dom';
import { Announcer } from '../ui/live-region';

const APP_NAME = 'Kerfbook';

/** The browser tab and the screen reader's first words for a page: "Station C1 — Kerfbook". */
export function usePageTitle(title: string | undefined) {
  useEffect(() => {
    if (!title) return;
    document.title = `${title} — ${APP_NAME}`;
    return () => {
      document.title = APP_NAME;
    };
  }, [title]);
}

/**
 * After moving to another page, focus goes to its main heading (once the page has drawn it), so
 * a keyboard or screen-reader user starts at the top of the new content rather than at the
 * link they left. Focus someone already placed in the page (a field with autofocus) is kept.
 */
function useFocusHeadingOnNavigation(pathname: string) {
  useEffect(() => {
    const main = document.getElementById('main');
    if (!main) return;
    const before = document.activeElement;
    const tryFocus = () => {
      const h1 = main.querySelector<HTMLElement>('h1');
      if (!h1) return false;
      const active = document.activeElement;
      const untouched = !active || active === document.body || !active.isConnected || active === before || active.closest('header');
      if (untouched) {
        if (!h1.hasAttribute('tabindex')) h1.tabIndex = -1;
        h1.focus();
      }
      return true;
    };
    if (tryFocus()) return;
    const watch = new MutationObserver(() => {
      if (tryFocus()) watch.disconnect();
    });
    watch.observe(main, { childList: true, subtree: true });
    const giveUp = setTimeout(() => watch.disconnect(), 15_000);
    return () => (watch.disconnect(), clearTimeout(giveUp));
  }, [pathname]);
}

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
  useFocusHeadingOnNavigation(pathname);
  const linkClass = (isActive: boolean, personal?: boolean) =>
    `flex min-h-touch items-center rounded px-3 font-semibold ${personal ? 'text-sm' : 'text-base'} ${isActive ? 'bg-white text-steel-900' : 'text-steel-100 hover:bg-steel-700'}`;
  const group = nav.find((i) => i.children?.some((c) => onPage(pathname, c)));
  const firstPersonal = nav.findIndex((i) => i.personal);
  return (
    <div className="min-h-screen">
      <a href="#main" className="sr-only focus:not-sr-only focus:absolute focus:left-2 focus:top-2 focus:z-50 focus:bg-white focus:p-2">
        Skip to content
      </a>
      <Announcer />
      <header className="no-print on-dark border-b-4 border-caution bg-steel-900 text-white">
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

/** The page's one h1; it also names the browser tab (`documentTitle` where the tab needs a shorter name). */
export function PageTitle({ title, subtitle, actions, documentTitle }: { title: string; subtitle?: string; actions?: ReactNode; documentTitle?: string }) {
  usePageTitle(documentTitle ?? title);
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

/** Where the page sits: links up the trail (each a 44 px target for a gloved finger), then the page itself. */
export type Crumb = { label: ReactNode; to: string };

/** "Machines › C1 › Arc starts": the way back up from a record's own page, each step a full-size target. */
export function Breadcrumbs({ trail, current }: { trail: Crumb[]; current: ReactNode }) {
  return (
    <nav aria-label="Breadcrumb" className="no-print text-sm">
      <ol className="flex flex-wrap items-center gap-x-1">
        {trail.map((c) => (
          <li key={c.to} className="flex items-center gap-x-1">
            <Link className="inline-flex min-h-touch min-w-touch items-center justify-center px-1 font-semibold underline" to={c.to}>
              {c.label}
            </Link>
            <span aria-hidden="true">›</span>
          </li>
        ))}
        <li aria-current="page" className="px-1">
          {current}
        </li>
      </ol>
    </nav>
  );
}
