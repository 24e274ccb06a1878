import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { diffLines, diffNotes } from '@/lib/note';
import { composed, manyEpisodesCase } from '@/tests/fixtures/notes/cases';

describe('diffNotes: what an amendment changed', () => {
  const v1 = composed(manyEpisodesCase()).note;
  const amendedRecord = manyEpisodesCase();
  amendedRecord.interventions.push({ t: 445, kind: 'chin_lift' });
  const v2 = composed(amendedRecord, {
    facts: {
      version: 2,
      freeText: 'Patient comfortable throughout.\nChin lift added on review.\nEscort present.',
      signatures: [
        { by: 'C. Nurse', role: 'nurse', at: '2026-03-02T09:55:00Z', kind: 'signed' },
        { by: 'C. Nurse', role: 'nurse', at: '2026-03-02T10:20:00Z', kind: 'amended', reason: 'chin lift not recorded at the time' },
      ],
    },
  }).note;

  it('first the nurse signs version 1, then amends it: the diff shows the version, the new intervention, the new text and the amendment', () => {
    const d = diffNotes(v1, v2);
    expect([d.fromVersion, d.toVersion]).toEqual([1, 2]);
    const removed = d.lines.filter((l) => l.op === 'removed').map((l) => l.text);
    const added = d.lines.filter((l) => l.op === 'added').map((l) => l.text);
    expect(removed).toContain('Version 1; 2 Mar 2026; times in Europe/Dublin');
    expect(added).toContain('Version 2; 2 Mar 2026; times in Europe/Dublin');
    expect(added).toContain('09:07:25 Chin lift (corrected)');
    expect(added).toContain('Chin lift added on review.');
    expect(added).toContain('Amended by C. Nurse (nurse), 2 Mar 2026 10:20; reason: chin lift not recorded at the time');
    expect(removed.some((l) => l.includes('Signed by'))).toBe(false);
    expect(d.added).toBe(added.length);
    expect(d.removed).toBe(removed.length);
    expect(d.unchanged + d.removed).toBe(v1.text.split('\n').length);
    expect(d.unchanged + d.added).toBe(v2.text.split('\n').length);
  });

  it('numbers the lines of both versions', () => {
    const d = diffNotes(v1, v2);
    const a = v1.text.split('\n');
    const b = v2.text.split('\n');
    for (const l of d.lines) {
      if (l.lineA !== null) expect(a[l.lineA - 1]).toBe(l.text);
      if (l.lineB !== null) expect(b[l.lineB - 1]).toBe(l.text);
    }
  });

  it('finds nothing changed between a note and itself', () => {
    const d = diffNotes(v1, v1);
    expect([d.added, d.removed]).toEqual([0, 0]);
    expect(d.unchanged).toBe(v1.text.split('\n').length);
  });
});

describe('diffLines', () => {
  it('keeps the common lines and puts removals before additions', () => {
    expect(diffLines('a\nb\nc', 'a\nc\nd').map((l) => `${l.op[0]} ${l.text}`)).toEqual(['u a', 'r b', 'u c', 'a d']);
    expect(diffLines('x', 'y').map((l) => `${l.op[0]} ${l.text}`)).toEqual(['r x', 'a y']);
  });

  it('rebuilds both texts from its lines and keeps a longest common subsequence (property)', () => {
    const lcsLength = (a: string[], b: string[]) => {
      const m = Array.from({ length: a.length + 1 }, () => new Array<number>(b.length + 1).fill(0));
      for (let i = a.length - 1; i >= 0; i--) for (let j = b.length - 1; j >= 0; j--) m[i][j] = a[i] === b[j] ? m[i + 1][j + 1] + 1 : Math.max(m[i + 1][j], m[i][j + 1]);
      return m[0][0];
    };
    const lines = fc.array(fc.constantFrom('a', 'b', 'c', 'd', ''), { maxLength: 12 });
    fc.assert(
      fc.property(lines, lines, (A, B) => {
        const a = A.join('\n');
        const b = B.join('\n');
        const d = diffLines(a, b);
        expect(d.filter((l) => l.op !== 'added').map((l) => l.text).join('\n')).toBe(a);
        expect(d.filter((l) => l.op !== 'removed').map((l) => l.text).join('\n')).toBe(b);
        expect(d.filter((l) => l.op === 'unchanged').length).toBe(lcsLength(a.split('\n'), b.split('\n')));
      }),
    );
  });
});
