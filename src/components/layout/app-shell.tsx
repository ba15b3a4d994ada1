import { useEffect, useState, type ReactNode } from 'react';
import { Link, NavLink, useLocation } from 'react-router';
import { LogOut, MoreHorizontal, ShieldCheck, UserRound } from 'lucide-react';
import type { NavItem } from '../../config/nav';
import { cn } from '../../lib/cn';
import { Logo } from './logo';

type Props = {
  nav: NavItem[];
  userName: string;
  organizationName: string;
  roleText: string;
  onSignOut: () => void;
  signingOut?: boolean;
  /** What waits on the person (a link with a count), beside "Sign out". */
  bell?: ReactNode;
  children: ReactNode;
};

/**
 * Desktop: a left rail. Phone: a top bar and a bottom tab bar within thumb reach, so that an installer on a
 * lift can move around with one hand.
 */
export function AppShell({
  nav,
  userName,
  organizationName,
  roleText,
  onSignOut,
  signingOut,
  bell,
  children,
}: Props) {
  return (
    <div className="min-h-dvh">
      <a
        href="#main"
        className="sr-only z-50 rounded bg-white px-3 py-2 focus:not-sr-only focus:fixed focus:top-2 focus:left-2"
      >
        Skip to content
      </a>
      <aside className="fixed inset-y-0 left-0 hidden w-60 flex-col border-r border-ink-200 bg-white lg:flex">
        <div className="flex items-center justify-between gap-2 py-4 pr-3 pl-5">
          <Logo className="text-lg text-ink-950" />
          {bell}
        </div>
        <nav aria-label="Main" className="flex-1 space-y-1 px-3">
          {nav.map((item) => (
            <NavLink
              key={item.to}
              to={item.to}
              end={item.end}
              className={({ isActive }) =>
                cn(
                  'flex items-center gap-3 rounded-lg px-3 py-2.5 text-sm font-medium',
                  isActive ? 'bg-brand-50 text-brand-800' : 'text-ink-700 hover:bg-ink-100',
                )
              }
            >
              <item.icon className="size-5" aria-hidden />
              {item.label}
            </NavLink>
          ))}
        </nav>
        <div className="border-t border-ink-100 px-4 py-4">
          <p className="truncate text-sm font-semibold text-ink-900">{userName}</p>
          <p className="truncate text-xs text-ink-600">
            {roleText} · {organizationName}
          </p>
          <div className="mt-3 flex flex-wrap gap-1">
            <NavLink
              to="/account"
              className="inline-flex items-center gap-2 rounded-md px-2 py-1.5 text-sm font-medium text-ink-700 hover:bg-ink-100"
            >
              <UserRound className="size-4" aria-hidden /> Your account
            </NavLink>
            <Link
              to="/security"
              className="inline-flex items-center gap-2 rounded-md px-2 py-1.5 text-sm font-medium text-ink-700 hover:bg-ink-100"
            >
              <ShieldCheck className="size-4" aria-hidden /> Security
            </Link>
            <button
              type="button"
              onClick={onSignOut}
              disabled={signingOut}
              className="inline-flex items-center gap-2 rounded-md px-2 py-1.5 text-sm font-medium text-ink-700 hover:bg-ink-100"
            >
              <LogOut className="size-4" aria-hidden /> Sign out
            </button>
          </div>
        </div>
      </aside>

      <header className="sticky top-0 z-30 flex h-14 items-center justify-between gap-3 border-b border-ink-200 bg-white/95 px-4 backdrop-blur lg:hidden">
        {/* The organisation's name under the logo, where it has the width the sign-out button does not need;
            the button never shrinks or wraps. */}
        <div className="flex min-w-0 flex-col leading-tight">
          <Logo className="text-base text-ink-950" />
          <span className="truncate text-xs text-ink-600" title={organizationName}>
            {organizationName}
          </span>
        </div>
        <div className="flex shrink-0 items-center gap-1">
          {bell}
          <NavLink
            to="/account"
            aria-label="Your account and security"
            className="inline-flex size-11 shrink-0 items-center justify-center rounded-lg text-ink-700 hover:bg-ink-100"
          >
            <UserRound className="size-5" aria-hidden />
          </NavLink>
          <button
            type="button"
            onClick={onSignOut}
            disabled={signingOut}
            className="inline-flex h-11 shrink-0 items-center gap-1.5 rounded-lg px-2.5 text-sm font-medium whitespace-nowrap text-ink-700 hover:bg-ink-100"
          >
            <LogOut className="size-4" aria-hidden /> <span>Sign out</span>
          </button>
        </div>
      </header>

      <main id="main" className="px-4 pt-5 pb-28 sm:px-6 lg:ml-60 lg:px-8 lg:pt-8 lg:pb-10">
        <div className="mx-auto max-w-6xl">{children}</div>
      </main>

      <PhoneTabs nav={nav} />
    </div>
  );
}

const tabClass = (active: boolean) =>
  cn(
    'flex h-16 w-full flex-col items-center justify-center gap-1 text-xs font-medium',
    active ? 'text-brand-700' : 'text-ink-600',
  );

/** The phone's bottom bar: the first four places within thumb reach, the rest behind "More". */
function PhoneTabs({ nav }: { nav: NavItem[] }) {
  const [open, setOpen] = useState(false);
  const location = useLocation();
  useEffect(() => setOpen(false), [location.pathname]);
  const primary = nav.length > 5 ? nav.slice(0, 4) : nav;
  const more = nav.length > 5 ? nav.slice(4) : [];
  const moreActive = more.some((i) => location.pathname.startsWith(i.to));
  return (
    <nav
      aria-label="Main"
      className="fixed inset-x-0 bottom-0 z-30 border-t border-ink-200 bg-white pb-[env(safe-area-inset-bottom)] lg:hidden"
    >
      {open ? (
        <ul id="more-places" className="border-b border-ink-100 py-1">
          {more.map((item) => (
            <li key={item.to}>
              <NavLink
                to={item.to}
                className={({ isActive }) =>
                  cn(
                    'flex h-12 items-center gap-3 px-5 text-sm font-medium',
                    isActive ? 'bg-brand-50 text-brand-800' : 'text-ink-800',
                  )
                }
              >
                <item.icon className="size-5" aria-hidden />
                {item.label}
              </NavLink>
            </li>
          ))}
        </ul>
      ) : null}
      <ul className="flex">
        {primary.map((item) => (
          <li key={item.to} className="min-w-0 flex-1">
            <NavLink to={item.to} end={item.end} className={({ isActive }) => tabClass(isActive)}>
              <item.icon className="size-6" aria-hidden />
              <span className="max-w-full truncate px-1">{item.label}</span>
            </NavLink>
          </li>
        ))}
        {more.length ? (
          <li className="min-w-0 flex-1">
            <button
              type="button"
              aria-expanded={open}
              aria-controls="more-places"
              onClick={() => setOpen((o) => !o)}
              className={tabClass(moreActive || open)}
            >
              <MoreHorizontal className="size-6" aria-hidden />
              More
            </button>
          </li>
        ) : null}
      </ul>
    </nav>
  );
}
