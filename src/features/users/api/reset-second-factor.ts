import { api } from '../../../lib/api-client';

/** An administrator's reset of a colleague's second factor (a lost phone): they set it up again. */
export const resetSecondFactor = (id: string) =>
  api<void>(`/users/${encodeURIComponent(id)}/second-factor/reset`, { method: 'POST', json: {} });
