import { z } from 'zod';
import { str } from './text';

/** What an administrator sets for their organisation. */
export const organizationSettingsSchema = z.strictObject({
  /** Credits above this amount need a second accountant's approval; null: none do. Manufacturers only. */
  creditSecondApprovalAbove: str()
    .trim()
    .regex(
      /^\d{1,10}(\.\d{1,2})?$/,
      'Enter an amount like "5000.00", or leave it empty for no second approval.',
    )
    .nullable(),
});
export type OrganizationSettingsInput = z.input<typeof organizationSettingsSchema>;

export type OrganizationSettingsDto = {
  id: string;
  name: string;
  kind: 'manufacturer' | 'contractor';
  creditSecondApprovalAbove: string | null;
};
