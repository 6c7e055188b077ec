import { NavLink, Navigate, Outlet, useLocation, useNavigate } from 'react-router-dom';
import { useQuery } from '@tanstack/react-query';
import { authQueries, useLogout } from '../features/auth/api';
import { ROLE_LABELS } from '../../shared/roles';
import { Loading } from '../components/ui/states';
import { navFor } from './nav';

export function Shell() {
  const me = useQuery(authQueries.me());
  const logout = useLogout();
  const navigate = useNavigate();
  const location = useLocation();
  // The plan board shows two weeks side by side: it takes the whole width of a workshop screen.
  const wide = location.pathname === '/plan';
  if (me.isPending) return <div className="p-6"><Loading what="your account" /></div>;
  if (!me.data) return <Navigate to="/sign-in" replace state={{ from: location.pathname }} />;
  const user = me.data;
  return (
    <div className="min-h-screen">
      <header className="no-print bg-ink text-paper">
        <div className="mx-auto flex max-w-7xl flex-wrap items-center gap-x-6 gap-y-2 px-4 py-2">
          <NavLink to="/" className="wordmark text-2xl text-paper">Lashline</NavLink>
          <nav aria-label="Main" className="flex flex-1 flex-wrap gap-1">
            {navFor(user.role).map((n) => (
              <NavLink
                key={n.to}
                to={n.to}
                className={({ isActive }) =>
                  `inline-flex min-h-tap items-center rounded-card px-3 font-semibold ${isActive ? 'bg-paper text-ink' : 'text-paper hover:bg-ink-soft'}`
                }
              >
                {n.label}
              </NavLink>
            ))}
          </nav>
          <div className="flex items-center gap-3 text-sm">
            <span>
              {user.name} · <span className="opacity-80">{ROLE_LABELS[user.role]}</span>
            </span>
            <button
              type="button"
              className="min-h-tap rounded-card border-2 border-paper/40 px-3 font-semibold hover:bg-ink-soft"
              onClick={() => logout.mutate(undefined, { onSettled: () => navigate('/sign-in', { replace: true }) })}
            >
              Sign out
            </button>
          </div>
        </div>
      </header>
      <main className={`mx-auto px-4 py-6 ${wide ? 'max-w-none' : 'max-w-7xl'}`}>
        <Outlet context={user} />
      </main>
    </div>
  );
}
