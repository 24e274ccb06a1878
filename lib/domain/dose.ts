import { z } from 'zod';
import { DOSE_UNITS, ROUTES } from './drug';

/** A dose as the bedside sends it: the id is made on the device so a retry is stored once. */
export const DoseInput = z.object({
  id: z.string().uuid({ message: 'must be a UUID made on the device' }),
  drugId: z.string().min(1).max(64),
  amount: z.number({ message: 'must be a number' }).positive({ message: 'must be more than 0' }).max(100_000, { message: 'is not a plausible amount' }),
  unit: z.enum(DOSE_UNITS, { message: `must be one of ${DOSE_UNITS.join(', ')}` }),
  route: z.enum(ROUTES, { message: `must be one of ${ROUTES.join(', ')}` }),
  at: z.iso.datetime({ offset: true, message: 'must be an ISO 8601 instant' }),
});
export type DoseInput = z.infer<typeof DoseInput>;
