import { Suspense, useState } from 'react';
import { NavLink, Outlet } from 'react-router-dom';
import { Button } from '../components/button';
import { Wordmark } from '../components/logo';
import { LoadingState } from '../components/states';
import { useSignOut } from '../features/auth/api/sign-out';
import { useHealth } from '../features/system/api/get-health';
import { errorMessage } from '../lib/api-client';
import { AreaIcon } from './area-icon';
import { visibleAreas, type Area } from './navigation';
import { roleName } from './role-name';
import { useSignedInUser } from './signed-in-user';

const groupTitles: Record<Area['group'], string> = { work: 'Work', team: 'Team', account: 'Account' };

/** The signed-in frame: navigation on the left, the person and sign-out at its foot, the page on the right. */
export function AppShell() {
  const user = useSignedInUser();
  const health = useHealth();
  const signOut = useSignOut();
  const [menuOpen, setMenuOpen] = useState(false);

  const shown = visibleAreas(user.role, health.data?.mail);
  const groups = (['work', 'team', 'account'] as const)
    .map((group) => ({ group, items: shown.filter((area) => area.group === group) }))
    .filter(({ items }) => items.length > 0);

  return (
    <div className="min-h-screen lg:grid lg:grid-cols-[16.5rem_1fr]">
      <a
        href="#main"
        className="sr-only z-50 rounded bg-white px-3 py-2 font-medium text-trace-700 focus:not-sr-only focus:fixed focus:top-2 focus:left-2"
      >
        Skip to content
      </a>
      <div className="on-dark bg-ink-950 text-ink-200">
        <div className="flex flex-col lg:sticky lg:top-0 lg:h-screen">
          <div className="flex items-center justify-between px-5 py-4 lg:py-6">
            <Wordmark tone="dark" />
            <button
              type="button"
              className="rounded-md border border-ink-700 px-3 py-1.5 text-ink-100 lg:hidden"
              aria-expanded={menuOpen}
              aria-controls="main-navigation"
              onClick={() => setMenuOpen((open) => !open)}
            >
              Menu
            </button>
          </div>
          <nav
            id="main-navigation"
            aria-label="Main"
            className={`${menuOpen ? 'block' : 'hidden'} flex-1 overflow-y-auto px-3 lg:block`}
          >
            {groups.map(({ group, items }) => (
              <div key={group} className="mb-5">
                <p className="px-3 pb-1.5 text-xs font-semibold tracking-[0.12em] text-ink-400 uppercase">
                  {groupTitles[group]}
                </p>
                <ul className="space-y-0.5">
                  {items.map((area) => (
                    <li key={area.id}>
                      <NavLink
                        to={area.path}
                        end={area.path === '/'}
                        onClick={() => setMenuOpen(false)}
                        className={({ isActive }) =>
                          `flex items-center gap-3 rounded-md px-3 py-2 font-medium transition-colors ${
                            isActive
                              ? 'bg-ink-800 text-white shadow-[inset_3px_0_0_var(--color-amber-300)]'
                              : 'text-ink-200 hover:bg-ink-900 hover:text-white'
                          }`
                        }
                      >
                        <AreaIcon id={area.id} />
                        {area.label}
                      </NavLink>
                    </li>
                  ))}
                </ul>
              </div>
            ))}
          </nav>
          <div className={`${menuOpen ? 'block' : 'hidden'} border-t border-ink-800 px-5 py-4 lg:block`}>
            <p className="truncate font-medium text-white" title={user.email}>
              {user.name}
            </p>
            <p className="text-[0.9375rem] text-ink-300">
              <span className="sr-only">Role: </span>
              {roleName(user.role)}
            </p>
            <Button
              variant="secondary"
              size="sm"
              className="mt-3 w-full !border-ink-600 !bg-ink-900 !text-white hover:!bg-ink-800"
              busy={signOut.isPending}
              busyLabel="Signing out…"
              onClick={() => signOut.mutate()}
            >
              Sign out
            </Button>
            {signOut.isError && (
              <p role="alert" className="mt-2 text-[0.9375rem] text-amber-300">
                {errorMessage(signOut.error)}
              </p>
            )}
          </div>
        </div>
      </div>
      <main id="main" tabIndex={-1} className="min-w-0 px-5 py-6 outline-none sm:px-8 lg:px-10 lg:py-8">
        <div className="mx-auto max-w-[88rem]">
          <Suspense fallback={<LoadingState label="Opening the page…" />}>
            <Outlet />
          </Suspense>
        </div>
      </main>
    </div>
  );
}
