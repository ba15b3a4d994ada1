import type { InstallationDetailDto, InstallationDto } from '../../../../shared/schemas/catalogue';
import { resourceQueries } from './resource-queries';

export type InstallationFilters = {
  page: number;
  q?: string;
  location?: string;
  enclosure?: string;
  nominalSupplyVolts?: string;
  sort?: string;
};

export const installationQueries = resourceQueries<
  InstallationFilters,
  InstallationDto,
  { installation: InstallationDetailDto }
>('installations');
