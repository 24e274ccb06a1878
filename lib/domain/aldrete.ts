import { z } from 'zod';

/**
 * Modified Aldrete (post-anaesthesia recovery) score.
 *
 * Source: Aldrete JA 1995, "The post-anesthesia recovery score revisited", J Clin Anesth 7:89-91
 * (citation and level wording from memory). Five items, each scored 0, 1 or 2; the 1995 revision
 * replaced the original colour item with oxygen saturation by pulse oximetry. A total of 9 or
 * more (of 10) is the discharge criterion. Because a total ≥ 9 leaves at most one item at 1,
 * no item can be 0 at discharge.
 *
 * The circulation item compares blood pressure with the pre-anaesthetic level; the 1995 table is
 * reproduced in mmHg here ("± 20 mmHg"); some reproductions write it as a percentage (± 20 %).
 * Plateau records the level the nurse chooses and does not compute it from cuff readings.
 */

export const ALDRETE_ITEMS = ['activity', 'respiration', 'circulation', 'consciousness', 'oxygenation'] as const;
export type AldreteItem = (typeof ALDRETE_ITEMS)[number];
export type AldreteLevel = 0 | 1 | 2;
export type AldreteItems = Record<AldreteItem, number>;

export interface AldreteItemSpec {
  label: string;
  /** What each level means, indexed by the level (0, 1, 2). */
  levels: readonly [string, string, string];
}

/** The five items and the published description of each level (Aldrete 1995). */
export const ALDRETE_SPECS: Record<AldreteItem, AldreteItemSpec> = {
  activity: {
    label: 'Activity',
    levels: ['Able to move 0 extremities voluntarily or on command', 'Able to move 2 extremities voluntarily or on command', 'Able to move 4 extremities voluntarily or on command'],
  },
  respiration: {
    label: 'Respiration',
    levels: ['Apnoeic', 'Dyspnoea or limited breathing', 'Able to breathe deeply and cough freely'],
  },
  circulation: {
    label: 'Circulation',
    levels: ['BP ± 50 mmHg or more of the pre-anaesthetic level', 'BP ± 20–49 mmHg of the pre-anaesthetic level', 'BP ± 20 mmHg of the pre-anaesthetic level'],
  },
  consciousness: {
    label: 'Consciousness',
    levels: ['Not responding', 'Arousable on calling', 'Fully awake'],
  },
  oxygenation: {
    label: 'Oxygen saturation',
    levels: ['SpO2 < 90 % even with supplemental oxygen', 'Needs oxygen to maintain SpO2 > 90 %', 'Able to maintain SpO2 > 92 % on room air'],
  },
};

/** The discharge criterion: a total of at least 9 of 10. */
export const ALDRETE_DISCHARGE_MIN = 9;
export const ALDRETE_MAX = 10;

/**
 * The total of the five items (0–10). Each item must be 0, 1 or 2.
 * @example aldreteTotal({ activity: 2, respiration: 2, circulation: 2, consciousness: 1, oxygenation: 2 }) //=> 9
 */
export function aldreteTotal(items: AldreteItems): number {
  let total = 0;
  for (const k of ALDRETE_ITEMS) {
    const v = items[k];
    if (v !== 0 && v !== 1 && v !== 2) throw new RangeError(`${k}: must be 0, 1 or 2 (got ${String(v)})`);
    total += v;
  }
  return total;
}

/**
 * Whether a total meets the discharge criterion (≥ 9).
 * @example meetsDischarge(9) //=> true
 */
export function meetsDischarge(total: number): boolean {
  return total >= ALDRETE_DISCHARGE_MIN;
}

const level = z
  .number({ message: 'must be 0, 1 or 2' })
  .int({ message: 'must be 0, 1 or 2' })
  .min(0, { message: 'must be 0, 1 or 2' })
  .max(2, { message: 'must be 0, 1 or 2' });

/** An Aldrete score as the bedside sends it; the id is made on the device so a retry is stored once. */
export const AldreteEntry = z.object({
  id: z.string().uuid({ message: 'must be a UUID made on the device' }),
  at: z.iso.datetime({ offset: true, message: 'must be an ISO 8601 instant' }),
  activity: level,
  respiration: level,
  circulation: level,
  consciousness: level,
  oxygenation: level,
});
export type AldreteEntry = z.infer<typeof AldreteEntry>;

/** An entry with its total and whether it meets the discharge criterion. */
export function scoreAldrete(entry: AldreteItems): { total: number; meetsDischarge: boolean } {
  const total = aldreteTotal(entry);
  return { total, meetsDischarge: meetsDischarge(total) };
}
