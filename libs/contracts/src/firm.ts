import { isSupportedLocale, isSupportedTimeZone } from '@trabeate/dates';
import { z } from 'zod';

// The firm's own settings that every person's screens, mails and PDFs follow.

/** GET/PUT /api/firm-settings: the locale dates are written in and the zone times are read in. */
export const firmDateSettingsSchema = z.object({
  dateLocale: z
    .string()
    .max(35)
    .refine(isSupportedLocale, { message: 'not a locale with date formats here (for example en-GB, en-US, hi-IN)' }),
  timeZone: z
    .string()
    .max(64)
    .refine(isSupportedTimeZone, { message: 'not an IANA time zone (for example Europe/London, Asia/Kolkata)' }),
});
export type FirmDateSettingsBody = z.infer<typeof firmDateSettingsSchema>;
