import type { InstallationDetailDto, InstallationInput } from '../../../../shared/schemas/catalogue';
import { api } from '../../../lib/api-client';

export const registerInstallation = (input: InstallationInput) =>
  api<{ installation: InstallationDetailDto }>('/installations', { method: 'POST', json: input });
