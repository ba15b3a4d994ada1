import { createContext, useContext, type ReactNode } from 'react';
import { defineAbilityFor, type AppAbility } from '../../shared/abilities';
import type { SessionDto } from './session';

// The same abilities the server enforces, used here only to hide what the user cannot do.
const AbilityContext = createContext<AppAbility>(defineAbilityFor(null));
const SessionContext = createContext<SessionDto | null>(null);

export const useAbility = () => useContext(AbilityContext);

/** The session on a signed-in screen, null elsewhere (the sign-in and invitation pages). */
export const useOptionalSession = () => useContext(SessionContext);

export function useSession(): SessionDto {
  const s = useContext(SessionContext);
  if (!s) throw new Error('useSession outside a signed-in screen');
  return s;
}

export function SessionProvider({ session, children }: { session: SessionDto; children: ReactNode }) {
  const ability = defineAbilityFor(
    { id: session.user.id, roles: session.user.roles, organization: session.user.organization },
    { demoMode: session.app.mode === 'demo' },
  );
  return (
    <SessionContext.Provider value={session}>
      <AbilityContext.Provider value={ability}>{children}</AbilityContext.Provider>
    </SessionContext.Provider>
  );
}
