import { NavLink, Navigate, Outlet, useLocation, useNavigate } from 'react-router-dom';
import { useQuery } from '@tanstack/react-query';
import { authQueries, useLogout } from '../features/auth/api';
import { ROLE_LABELS } from '../../shared/roles';
import { Loading } from '../components/ui/states';
import { navFor } from './nav';
import { OfflineBar } from './offline-bar';
import { UpdateOffer } from './update-offer';
import { useQueue } from '../lib/offline/queue';
import { draftCount } from '../lib/use-draft';
import type { SessionUser } from '../../shared/schemas/auth';

export function Shell() {
  const me = useQuery(authQueries.me());
  const location = useLocation();
  // The plan board shows two weeks side by side: it takes the whole width of a workshop screen.
  const wide = location.pathname === '/plan';
  if (me.isPending) return <div className="p-6"><Loading what="your account" /></div>;
  if (!me.data) return <Navigate to="/sign-in" replace state={{ from: location.pathname }} />;
  return <SignedIn user={me.data} wide={wide} />;
}

function SignedIn({ user, wide }: { user: SessionUser; wide: boolean }) {
  const logout = useLogout(user.id);
  const navigate = useNavigate();
  const queue = useQueue();
  const signOut = () => {
    const unsent = queue.changes.filter((c) => c.userId === user.id).length;
    const drafts = draftCount();
    // A shared tablet keeps no one's data after they sign out: what has not been sent goes too.
    const what = [
      unsent && `${unsent === 1 ? 'One change made on this device has' : `${unsent} changes made on this device have`} not been sent`,
      drafts && `${drafts === 1 ? 'one form is' : `${drafts} forms are`} half filled in`,
    ].filter(Boolean);
    if (what.length && !window.confirm(`${what.join(', and ')}. Signing out deletes ${unsent + drafts === 1 ? 'it' : 'them'} from this device. Sign out anyway?`.replace(/^./, (c) => c.toUpperCase()))) return;
    logout.mutate(undefined, { onSettled: () => navigate('/sign-in', { replace: true }) });
  };
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
              onClick={signOut}
            >
              Sign out
            </button>
          </div>
        </div>
      </header>
      <UpdateOffer />
      <OfflineBar user={user} />
      <main className={`mx-auto px-4 py-6 ${wide ? 'max-w-none' : 'max-w-7xl'}`}>
        <Outlet context={user} />
      </main>
    </div>
  );
}
