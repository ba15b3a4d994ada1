import { api } from '../../../lib/api-client';

export const logout = () => api<void>('/auth/logout', { method: 'POST' });
