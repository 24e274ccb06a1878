import { z } from 'zod';
import { DOSE_UNITS, ROUTES } from './drug';
import { INTERVENTION_KINDS } from './intervention';
import { CASE_EVENT_KINDS } from './caseRecord';

/**
 * What the bedside sends: one entry per tap. The id is made on the device, so an entry retried
 * from the offline outbox is stored once (the server is idempotent on it).
 */
const id = z.string().uuid({ message: 'must be a UUID made on the device' });
const at = z.iso.datetime({ offset: true, message: 'must be an ISO 8601 instant' });
const note = z.string().trim().max(500, { message: 'must be at most 500 characters' }).optional();

export const DoseEntryInput = z.object({
  type: z.literal('dose'),
  id,
  at,
  drugId: z.string().min(1, { message: 'is required' }).max(64),
  amount: z.number({ message: 'must be a number' }).positive({ message: 'must be more than 0' }).max(100_000, { message: 'is not a plausible amount' }),
  unit: z.enum(DOSE_UNITS, { message: `must be one of ${DOSE_UNITS.join(', ')}` }),
  route: z.enum(ROUTES, { message: `must be one of ${ROUTES.join(', ')}` }),
});

export const InterventionEntryInput = z.object({
  type: z.literal('intervention'),
  id,
  at,
  kind: z.enum(INTERVENTION_KINDS as [string, ...string[]], { message: 'is not a known intervention' }),
  note,
});

export const EventEntryInput = z.object({
  type: z.literal('event'),
  id,
  at,
  kind: z.enum(CASE_EVENT_KINDS, { message: `must be one of ${CASE_EVENT_KINDS.join(', ')}` }),
  note,
});

/** A blood gas; PaCO2 in the unit it was read in (kPa is converted to mmHg when stored). */
export const BloodGasEntryInput = z
  .object({
    type: z.literal('blood_gas'),
    id,
    at,
    paco2: z.number({ message: 'must be a number' }).positive({ message: 'must be more than 0' }),
    unit: z.enum(['mmHg', 'kPa'], { message: 'must be mmHg or kPa' }),
    ph: z.number({ message: 'must be a number' }).min(6.5, { message: 'must be between 6.5 and 8.0' }).max(8.0, { message: 'must be between 6.5 and 8.0' }).nullable().optional(),
    pao2: z.number({ message: 'must be a number' }).positive().max(800, { message: 'is not plausible' }).nullable().optional(),
    fio2: z.number({ message: 'must be a number' }).min(0.21, { message: 'must be a fraction 0.21–1.0' }).max(1, { message: 'must be a fraction 0.21–1.0' }).nullable().optional(),
    sampleType: z.enum(['arterial', 'venous', 'capillary'], { message: 'must be arterial, venous or capillary' }).default('arterial'),
  })
  .refine((g) => (g.unit === 'mmHg' ? g.paco2 >= 5 && g.paco2 <= 200 : g.paco2 >= 0.7 && g.paco2 <= 27), { message: 'is out of range for the unit (mmHg 5–200, kPa 0.7–27)', path: ['paco2'] });

const opt = (min: number, max: number, what: string) =>
  z.number({ message: 'must be a number' }).min(min, { message: `${what}: must be at least ${min}` }).max(max, { message: `${what}: must be at most ${max}` }).nullable().optional();

export const VitalEntryInput = z
  .object({
    type: z.literal('vital'),
    id,
    at,
    sbp: opt(20, 300, 'mmHg'),
    dbp: opt(10, 200, 'mmHg'),
    hr: opt(0, 300, '/min'),
    spo2: opt(0, 100, '%'),
    rr: opt(0, 80, '/min'),
    etco2: opt(0, 150, 'mmHg'),
    sedationScore: z.number().int({ message: 'must be a whole number 0–5' }).min(0, { message: 'must be 0–5' }).max(5, { message: 'must be 0–5' }).nullable().optional(),
  })
  .refine((v) => [v.sbp, v.dbp, v.hr, v.spo2, v.rr, v.etco2, v.sedationScore].some((x) => x !== null && x !== undefined), { message: 'enter at least one reading', path: ['sbp'] })
  .refine((v) => v.sbp == null || v.dbp == null || v.sbp > v.dbp, { message: 'systolic must be above diastolic', path: ['dbp'] });

const item = z.number().int({ message: 'must be 0, 1 or 2' }).min(0, { message: 'must be 0, 1 or 2' }).max(2, { message: 'must be 0, 1 or 2' });
export const RecoveryEntryInput = z.object({
  type: z.literal('recovery'),
  id,
  at,
  activity: item,
  respiration: item,
  circulation: item,
  consciousness: item,
  oxygenation: item,
});

export const ENTRY_TARGETS = ['dose', 'intervention', 'event', 'vital', 'recovery', 'blood_gas'] as const;
export type EntryTarget = (typeof ENTRY_TARGETS)[number];

export const VoidEntryInput = z.object({
  type: z.literal('void'),
  id,
  at,
  target: z.enum(ENTRY_TARGETS),
  targetId: z.string().min(1).max(80),
  reason: z.string().trim().min(3, { message: 'say why (at least 3 characters)' }).max(300, { message: 'must be at most 300 characters' }),
});

export const RetimeEntryInput = z.object({
  type: z.literal('retime'),
  id,
  at,
  target: z.enum(['dose', 'intervention', 'event', 'vital'] as const),
  targetId: z.string().min(1).max(80),
  newAt: z.iso.datetime({ offset: true, message: 'must be an ISO 8601 instant' }),
  reason: z.string().trim().max(300).optional(),
});

export const EntryInput = z.union([DoseEntryInput, InterventionEntryInput, EventEntryInput, VitalEntryInput, RecoveryEntryInput, BloodGasEntryInput, VoidEntryInput, RetimeEntryInput]);
export type EntryInput = z.infer<typeof EntryInput>;

/** Parses one entry, choosing the schema by `type` first so messages name the real fields. */
export function parseEntry(body: unknown): EntryInput {
  const type = typeof body === 'object' && body !== null ? (body as { type?: unknown }).type : undefined;
  const schema = { dose: DoseEntryInput, intervention: InterventionEntryInput, event: EventEntryInput, vital: VitalEntryInput, recovery: RecoveryEntryInput, blood_gas: BloodGasEntryInput, void: VoidEntryInput, retime: RetimeEntryInput }[String(type)];
  if (!schema) return z.object({ type: z.enum(['dose', 'intervention', 'event', 'vital', 'recovery', 'blood_gas', 'void', 'retime'], { message: 'must be dose, intervention, event, vital, recovery, blood_gas, void or retime' }) }).parse(body) as never;
  return schema.parse(body);
}
