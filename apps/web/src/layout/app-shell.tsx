// The signed-in frame: top bar with the main places, the theme switch and the account.
import { NavLink, Navigate, Outlet, useLocation, useNavigate } from 'react-router';
import { useMe, useSignOut } from '../lib/session.ts';
import { useTheme } from '../lib/theme.ts';
import { Logo } from '../components/logo.tsx';
import { Button, Notice, Spinner } from '../components/ui.tsx';

function navClass({ isActive }: { isActive: boolean }) {
  return `rounded-md px-3 py-2 text-sm font-medium ${isActive ? 'bg-accent-soft text-accent-strong' : 'text-[var(--muted)] hover:text-[var(--ink)]'}`;
}

export function AppShell() {
  const me = useMe();
  const location = useLocation();
  const navigate = useNavigate();
  const signOut = useSignOut();
  const [theme, toggleTheme] = useTheme();

  if (me.isPending) {
    return (
      <div className="flex h-full items-center justify-center">
        <Spinner label="Loading your account…" />
      </div>
    );
  }
  if (me.isError) {
    return (
      <div className="mx-auto max-w-lg p-8">
        <Notice tone="error">{me.error.message}</Notice>
      </div>
    );
  }
  if (!me.data) return <Navigate to={`/sign-in?next=${encodeURIComponent(location.pathname + location.search)}`} replace />;
  const user = me.data.user;

  return (
    <div className="flex min-h-full flex-col">
      <header className="sticky top-0 z-20 border-b border-[var(--line)] bg-[var(--panel)]/95 backdrop-blur">
        <div className="mx-auto flex h-14 max-w-7xl items-center gap-4 px-4">
          <NavLink to="/campaigns" aria-label="Resonote home">
            <Logo />
          </NavLink>
          <nav className="flex items-center gap-1" aria-label="Main">
            <NavLink to="/campaigns" className={navClass}>
              Campaigns
            </NavLink>
            <NavLink to="/lab" className={navClass}>
              Lab kit
            </NavLink>
            {user.role === 'admin' && (
              <NavLink to="/admin/mail" className={navClass}>
                Mail
              </NavLink>
            )}
          </nav>
          <div className="ml-auto flex items-center gap-2">
            <Button variant="ghost" onClick={toggleTheme} aria-label={`Switch to the ${theme === 'light' ? 'dark' : 'light'} theme`} title="Light theme for the office, dark for dim test halls">
              {theme === 'light' ? '☾ Dark' : '☀ Light'}
            </Button>
            <div className="hidden text-right leading-tight sm:block">
              <NavLink to="/account" className="text-sm font-medium hover:underline" data-testid="user-name" title="Your account and API tokens">
                {user.name}
              </NavLink>
              <div className="text-xs text-[var(--muted)]">{user.role === 'admin' ? 'Instance admin' : user.email}</div>
            </div>
            <NavLink to="/account" className={(a) => `${navClass(a)} sm:hidden`}>
              Account
            </NavLink>
            <Button
              variant="secondary"
              onClick={async () => {
                await signOut();
                navigate('/sign-in', { replace: true });
              }}
            >
              Sign out
            </Button>
          </div>
        </div>
      </header>
      <main className="mx-auto w-full max-w-7xl flex-1 px-4 py-6">
        <Outlet />
      </main>
      <footer className="border-t border-[var(--line)] px-4 py-3 text-center text-xs text-[var(--muted)]">
        Secure the structure and the hammer, wear eye protection, and keep clear of rotating or energised machinery. Structural judgements drawn from these results belong to licensed practice under local codes.
      </footer>
    </div>
  );
}
