import { describe, expect, it } from 'vitest';
import { ALDRETE_ITEMS, ALDRETE_SPECS, AldreteEntry, aldreteTotal, meetsDischarge, scoreAldrete, type AldreteItems } from '@/lib/domain/aldrete';

// Source: Aldrete JA 1995, "The post-anesthesia recovery score revisited", J Clin Anesth 7:89-91
// (citation and level wording from memory; references.md: five items each 0–2, discharge at ≥ 9 — found).

const all = (n: number): AldreteItems => ({ activity: n, respiration: n, circulation: n, consciousness: n, oxygenation: n });

describe('modified Aldrete score (Aldrete 1995, J Clin Anesth 7:89-91)', () => {
  it('has five items — activity, respiration, circulation, consciousness, oxygen saturation — each with three levels', () => {
    expect(ALDRETE_ITEMS).toEqual(['activity', 'respiration', 'circulation', 'consciousness', 'oxygenation']);
    for (const k of ALDRETE_ITEMS) expect(ALDRETE_SPECS[k].levels).toHaveLength(3);
    expect(ALDRETE_SPECS.oxygenation.label).toBe('Oxygen saturation');
  });

  it('describes the levels as published (from memory): 2 = 4 extremities, deep breath and cough, BP ± 20 mmHg, fully awake, SpO2 > 92 % on air', () => {
    expect(ALDRETE_SPECS.activity.levels[2]).toBe('Able to move 4 extremities voluntarily or on command');
    expect(ALDRETE_SPECS.activity.levels[1]).toBe('Able to move 2 extremities voluntarily or on command');
    expect(ALDRETE_SPECS.respiration.levels).toEqual(['Apnoeic', 'Dyspnoea or limited breathing', 'Able to breathe deeply and cough freely']);
    expect(ALDRETE_SPECS.circulation.levels[2]).toMatch(/± 20 mmHg of the pre-anaesthetic level/);
    expect(ALDRETE_SPECS.consciousness.levels).toEqual(['Not responding', 'Arousable on calling', 'Fully awake']);
    expect(ALDRETE_SPECS.oxygenation.levels).toEqual(['SpO2 < 90 % even with supplemental oxygen', 'Needs oxygen to maintain SpO2 > 90 %', 'Able to maintain SpO2 > 92 % on room air']);
  });

  it('adds the five items: 0 to 10', () => {
    expect(aldreteTotal(all(0))).toBe(0);
    expect(aldreteTotal(all(2))).toBe(10);
    expect(aldreteTotal({ activity: 2, respiration: 2, circulation: 2, consciousness: 1, oxygenation: 1 })).toBe(8);
  });

  it('meets the discharge criterion at 9 and 10, not at 8', () => {
    expect(meetsDischarge(8)).toBe(false);
    expect(meetsDischarge(9)).toBe(true);
    expect(meetsDischarge(10)).toBe(true);
    expect(scoreAldrete({ activity: 2, respiration: 2, circulation: 2, consciousness: 1, oxygenation: 2 })).toEqual({ total: 9, meetsDischarge: true });
  });

  it('never lets a patient with any item at 0 meet discharge (all 243 combinations)', () => {
    for (let n = 0; n < 3 ** 5; n++) {
      const levels = ALDRETE_ITEMS.map((_, i) => Math.floor(n / 3 ** i) % 3);
      const items = Object.fromEntries(ALDRETE_ITEMS.map((k, i) => [k, levels[i]])) as AldreteItems;
      const { total, meetsDischarge: ok } = scoreAldrete(items);
      expect(total).toBe(levels.reduce((a, b) => a + b, 0));
      if (levels.includes(0)) expect(ok).toBe(false);
    }
  });

  it('refuses a level other than 0, 1 or 2', () => {
    expect(() => aldreteTotal({ ...all(2), activity: 3 })).toThrow('activity: must be 0, 1 or 2 (got 3)');
    expect(() => aldreteTotal({ ...all(2), circulation: 1.5 })).toThrow(RangeError);
    expect(() => aldreteTotal({ ...all(2), oxygenation: -1 })).toThrow(RangeError);
  });

  it('parses a bedside entry with zod, naming the field of a bad level', () => {
    const good = { id: '6f1c1f9e-9a7b-4c39-8a3e-2f1d3c4b5a69', at: '2026-03-02T10:15:00Z', ...all(2) };
    expect(AldreteEntry.parse(good)).toEqual(good);
    const bad = AldreteEntry.safeParse({ ...good, consciousness: 3 });
    expect(bad.success).toBe(false);
    expect(bad.error?.issues[0]).toMatchObject({ path: ['consciousness'], message: 'must be 0, 1 or 2' });
    expect(AldreteEntry.safeParse({ ...good, at: 'later' }).error?.issues[0].message).toBe('must be an ISO 8601 instant');
  });
});
