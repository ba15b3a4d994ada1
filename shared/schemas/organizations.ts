import { z } from 'zod';
import { isLocale, isTimeZone } from '../dates';
import { str } from './text';

/** The credit second-approval amount, as the form checks it (also part of updateOrganizationSchema). */
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
/**
 * PATCH /api/organizations/current: what an administrator may change about their own organisation, any of them
 * at once: the zone and locale dates are shown in, and (manufacturers only) the credit second-approval amount.
 */
export const updateOrganizationSchema = z
  .strictObject({
    timeZone: str()
      .trim()
      .refine(isTimeZone, 'Pick a time zone from the list (an IANA name such as America/Chicago).')
      .optional(),
    locale: str()
      .trim()
      .refine(isLocale, 'Pick a language and region from the list (such as en-US).')
      .optional(),
    creditSecondApprovalAbove: organizationSettingsSchema.shape.creditSecondApprovalAbove.optional(),
  })
  .refine((v) => Object.keys(v).length > 0, 'Nothing to change.');
export type UpdateOrganizationInput = z.infer<typeof updateOrganizationSchema>;

/** GET /api/organizations/current: the organisation and its settings. */
export type OrganizationDto = {
  id: string;
  name: string;
  kind: 'manufacturer' | 'contractor';
  timeZone: string;
  locale: string;
  /** Credits above this amount need a second accountant's approval; null: none do. */
  creditSecondApprovalAbove: string | null;
};
