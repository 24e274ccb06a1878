import { z } from 'zod';
import { ASA_CLASSES, DEPTHS } from './caseFacts';

/** Case facts a nurse may change on the sheet, each with its own check. */
export const EDITABLE_FIELDS = {
  weightKg: z.number({ message: 'must be a number' }).min(1, { message: 'must be at least 1 kg' }).max(400, { message: 'must be at most 400 kg' }).nullable(),
  heightCm: z.number({ message: 'must be a number' }).min(30, { message: 'must be at least 30 cm' }).max(250, { message: 'must be at most 250 cm' }).nullable(),
  asaClass: z.enum(ASA_CLASSES, { message: 'must be I–VI' }).nullable(),
  asaEmergency: z.boolean(),
  airwayClass: z.enum(['I', 'II', 'III', 'IV'], { message: 'must be Mallampati I–IV' }).nullable(),
  allergies: z.string().trim().max(500).nullable(),
  plannedDepth: z.enum(DEPTHS, { message: 'must be minimal, moderate, deep or general' }),
  reachedDepth: z.enum(DEPTHS, { message: 'must be minimal, moderate, deep or general' }).nullable(),
  baselineSpo2: z.number().min(50).max(100).nullable(),
  oxygenDelivery: z.string().trim().max(80).nullable(),
} as const;
export type EditableField = keyof typeof EDITABLE_FIELDS;

/**
 * An edit says what each field was when the nurse saw it and what it should become, so the
 * server can refuse exactly the fields someone else changed meanwhile (never overwrite silently).
 */
export const CaseEditInput = z.object({
  changes: z
    .record(z.string(), z.object({ from: z.unknown(), to: z.unknown() }))
    .refine((c) => Object.keys(c).length > 0, { message: 'change at least one field' })
    .refine((c) => Object.keys(c).every((k) => k in EDITABLE_FIELDS), { message: `only ${Object.keys(EDITABLE_FIELDS).join(', ')} can be changed here` }),
});

/** Validates each change's new value with the field's own schema; returns typed values. */
export function parseChanges(changes: Record<string, { from: unknown; to: unknown }>): { field: EditableField; from: unknown; to: unknown }[] {
  return Object.entries(changes).map(([k, v]) => {
    const field = k as EditableField;
    const r = EDITABLE_FIELDS[field].safeParse(v.to);
    if (!r.success) throw new CaseEditError(`changes.${field}: ${r.error.issues[0]?.message ?? 'invalid'}`);
    return { field, from: v.from, to: r.data };
  });
}

export class CaseEditError extends Error {}
