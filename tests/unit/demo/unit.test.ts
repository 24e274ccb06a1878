import { describe, expect, it } from 'vitest';
import { DOSE_UNITS, KNOWN_DRUG_CLASS, ROUTES } from '@/lib/domain/drug';
import { DEMO_FORMULARY, DEMO_PROCEDURALISTS, DEMO_PROCEDURES, DEMO_ROOMS, DEMO_STAFF, DEMO_UNIT, PROCEDURE_IDS, formularyDrug } from '@/lib/demo';

describe('the fictional Kestrel Bay Day Procedures Unit', () => {
  it('has four rooms, a real IANA zone and Mon–Fri 08:00–17:00 lists', () => {
    expect(DEMO_ROOMS).toHaveLength(4);
    expect(new Set(DEMO_ROOMS.map((r) => r.id)).size).toBe(4);
    expect(() => new Intl.DateTimeFormat('en', { timeZone: DEMO_UNIT.timeZone })).not.toThrow();
    expect(DEMO_UNIT.workingDays).toEqual([1, 2, 3, 4, 5]);
    expect(DEMO_UNIT.workingHours).toEqual({ start: '08:00', end: '17:00' });
  });

  it('is staffed by six nurses, two leads, a safety officer and an admin with unique demo usernames', () => {
    const count = (role: string) => DEMO_STAFF.filter((s) => s.role === role).length;
    expect([count('nurse'), count('lead'), count('safety_officer'), count('admin')]).toEqual([6, 2, 1, 1]);
    expect(new Set(DEMO_STAFF.map((s) => s.username)).size).toBe(DEMO_STAFF.length);
    for (const s of DEMO_STAFF) {
      expect(s.username).toMatch(/^(nurse|lead|safety|admin)\.[a-z]+$/);
      expect(s.displayName.length).toBeGreaterThan(3);
    }
  });

  it('can do every procedure it offers: a room and a proceduralist for each', () => {
    expect(DEMO_PROCEDURES.map((p) => p.id).sort()).toEqual([...PROCEDURE_IDS].sort());
    expect(DEMO_PROCEDURES.reduce((s, p) => s + p.share, 0)).toBeCloseTo(1, 10);
    expect(DEMO_PROCEDURALISTS.length).toBeGreaterThanOrEqual(6);
    for (const p of DEMO_PROCEDURES) {
      expect(DEMO_ROOMS.some((r) => r.procedures.includes(p.id))).toBe(true);
      expect(DEMO_PROCEDURALISTS.some((d) => d.procedures.includes(p.id))).toBe(true);
      expect(p.typicalMin.min).toBeLessThanOrEqual(p.typicalMin.median);
      expect(p.typicalMin.median).toBeLessThanOrEqual(p.typicalMin.max);
      // The longest case (≤ 10.5 min before the scope, the procedure, ≤ 4 min after) fits its booked slot.
      expect(10.5 + p.typicalMin.max + 4).toBeLessThanOrEqual(p.slotMin);
    }
  });

  it('keeps a formulary whose classes, units and routes match the shared drug table', () => {
    for (const d of DEMO_FORMULARY) {
      if (KNOWN_DRUG_CLASS[d.drug]) expect(d.drugClass).toBe(KNOWN_DRUG_CLASS[d.drug]);
      expect(DOSE_UNITS).toContain(d.unit);
      expect(ROUTES).toContain(d.route);
      expect(d.usualDose).toBeGreaterThan(0);
      expect(d.cautionAbove).toBeGreaterThan(d.usualDose);
    }
    expect(formularyDrug('propofol')).toMatchObject({ unit: 'mg', concentration: '10 mg/mL', usualDose: 30, cautionAbove: 100 });
    expect(formularyDrug('fentanyl').unit).toBe('mcg');
    expect(formularyDrug('naloxone').unit).toBe('mcg');
    expect(formularyDrug('flumazenil').unit).toBe('mg');
    expect(() => formularyDrug('unobtainium')).toThrow(/not in the demo formulary/);
  });
});
