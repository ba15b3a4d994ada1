import type { MeSecondFactor } from '../../shared/schemas/security';
import type { MeDto } from '../../shared/schemas/users';

/** What GET /api/auth/me answers: the signed-in person and the app's mode. */
export type SessionDto = {
  user: MeDto;
  app: { mode: 'demo' | 'production' };
  /** Whether the person has a second factor and must have one (then they are held at /security until they do). */
  secondFactor?: MeSecondFactor;
};
