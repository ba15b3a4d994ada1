import { z } from 'zod';
import { isLocale, isTimeZone } from '../dates';

/** What an administrator may change about their own organisation: the zone and locale dates are shown in. */
export const updateOrganizationSchema = z
  .strictObject({
    timeZone: z
      .string()
      .trim()
      .refine(isTimeZone, 'Pick a time zone from the list (an IANA name such as America/Chicago).')
      .optional(),
    locale: z
      .string()
      .trim()
      .refine(isLocale, 'Pick a language and region from the list (such as en-US).')
      .optional(),
  })
  .refine((v) => Object.keys(v).length > 0, 'Nothing to change.');
export type UpdateOrganizationInput = z.infer<typeof updateOrganizationSchema>;

export type OrganizationDto = {
  id: string;
  name: string;
  kind: 'manufacturer' | 'contractor';
  timeZone: string;
  locale: string;
};
