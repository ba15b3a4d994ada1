import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { Navigate, Outlet, useLocation, useNavigate } from 'react-router';
import { ROLE_LABELS } from '../../../shared/roles';
import { AppShell } from '../../components/layout/app-shell';
import { Spinner } from '../../components/ui/spinner';
import { navFor } from '../../config/nav';
import { authQueries } from '../../features/auth/api/auth-queries';
import { logout } from '../../features/auth/api/logout';
import { WaitingBell } from '../../features/waiting/components/waiting-bell';
import { SessionProvider, useAbility, useSession } from '../../lib/ability';

function Shell() {
  const { user } = useSession();
  const ability = useAbility();
  const qc = useQueryClient();
  const navigate = useNavigate();
  const signOut = useMutation({
    mutationFn: logout,
    onSettled: () => {
      qc.clear();
      navigate('/sign-in', { replace: true });
    },
  });
  return (
    <AppShell
      nav={navFor(ability)}
      userName={user.name}
      organizationName={user.organization.name}
      roleText={user.roles.map((r) => ROLE_LABELS[r]).join(', ')}
      onSignOut={() => signOut.mutate()}
      signingOut={signOut.isPending}
      bell={<WaitingBell />}
    >
      <Outlet />
    </AppShell>
  );
}

/** Everything behind sign-in: waits for the session, sends strangers to the sign-in screen. */
export function AppRoot() {
  const location = useLocation();
  const session = useQuery(authQueries.me());
  if (session.isPending) {
    return (
      <div className="grid min-h-dvh place-items-center">
        <Spinner size="lg" label="Loading Lumenproof" />
      </div>
    );
  }
  if (session.isError) throw session.error;
  if (!session.data) {
    const next =
      location.pathname === '/' ? '' : `?next=${encodeURIComponent(location.pathname + location.search)}`;
    return <Navigate to={`/sign-in${next}`} replace />;
  }
  const sf = session.data.secondFactor;
  if (sf?.required && !sf.enrolled && location.pathname !== '/security') {
    return <Navigate to="/security" replace />;
  }
  return (
    <SessionProvider session={session.data}>
      <Shell />
    </SessionProvider>
  );
}
