import type { DeskOptionDto } from '../../../shared/claims/workflow';
import { pick } from '../../lib/present';

// The desk's pickers name people and organisations by id and name only: a reviewer's e-mail and roles, or a
// contractor's address, are not the picker's business.

const OPTION_FIELDS = ['id', 'name'] as const;

export const presentDeskOption = (row: { id: string; name: string }): DeskOptionDto =>
  pick(row, OPTION_FIELDS);
