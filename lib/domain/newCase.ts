import { z } from 'zod';
import { ASA_CLASSES, DEPTHS } from './caseFacts';

const yesNo = z.boolean().nullable().optional();
const num = (min: number, max: number, unit: string) =>
  z.number({ message: 'must be a number' }).min(min, { message: `must be at least ${min} ${unit}` }).max(max, { message: `must be at most ${max} ${unit}` });

export const NewPatientInput = z.object({
  mrn: z.string().trim().min(1, { message: 'is required' }).max(40, { message: 'must be at most 40 characters' }),
  familyName: z.string().trim().min(1, { message: 'is required' }).max(80),
  givenName: z.string().trim().min(1, { message: 'is required' }).max(80),
  birthDate: z.string().regex(/^\d{4}-\d{2}-\d{2}$/, { message: 'must be a date (YYYY-MM-DD)' }),
  sex: z.enum(['female', 'male', 'other', 'unknown'], { message: 'must be female, male, other or unknown' }),
});

/** Opening a case: an existing patient by id, or a new one. */
export const NewCaseInput = z
  .object({
    patientId: z.string().min(1).max(80).optional(),
    patient: NewPatientInput.optional(),
    procedureType: z.string().trim().min(1, { message: 'choose a procedure' }).max(40),
    roomId: z.string().min(1, { message: 'choose a room' }).max(80),
    proceduralistId: z.string().max(80).nullable().optional(),
    plannedDepth: z.enum(DEPTHS, { message: 'choose the planned depth' }),
    asaClass: z.enum(ASA_CLASSES, { message: 'choose an ASA class I–VI' }).nullable().optional(),
    asaEmergency: z.boolean().optional(),
    weightKg: num(1, 400, 'kg').nullable().optional(),
    heightCm: num(30, 250, 'cm').nullable().optional(),
    neckCm: num(15, 80, 'cm').nullable().optional(),
    stopBang: z.object({ snoring: yesNo, tired: yesNo, observed: yesNo, pressure: yesNo, neck: yesNo }).optional(),
    airwayClass: z.enum(['I', 'II', 'III', 'IV'], { message: 'must be Mallampati I–IV' }).nullable().optional(),
    fastingSolidsAt: z.iso.datetime({ offset: true, message: 'must be an ISO 8601 instant' }).nullable().optional(),
    fastingClearsAt: z.iso.datetime({ offset: true, message: 'must be an ISO 8601 instant' }).nullable().optional(),
    allergies: z.string().trim().max(500).nullable().optional(),
    baselineSpo2: num(50, 100, '%').nullable().optional(),
    oxygenDelivery: z.string().trim().max(80).nullable().optional(),
    etco2Unit: z.enum(['mmHg', 'kPa']).optional(),
  })
  .refine((v) => !!v.patientId !== !!v.patient, { message: 'choose a patient or add a new one (not both)', path: ['patient'] });
export type NewCaseInput = z.infer<typeof NewCaseInput>;
