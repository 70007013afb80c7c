import '../luxon-clock';
import { z } from 'zod';
import { IANAZone } from 'luxon';
import { oneLine } from './text';

export const orgSettingsSchema = z.object({
  name: oneLine(z.string().trim().min(2, 'Enter the shop’s name').max(200, 'Name is too long')),
  timeZone: z
    .string()
    .trim()
    .refine((tz) => IANAZone.isValidZone(tz), 'Not a known time zone: use an IANA name such as America/Chicago'),
});
export type OrgSettingsInput = z.infer<typeof orgSettingsSchema>;
