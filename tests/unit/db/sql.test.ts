import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { Mutex, asBool, asDate, asDateOrNull, chunkRows, ident, isUniqueViolation, numberedPlaceholders } from '@/lib/db/sql';

describe('numberedPlaceholders: one SQL text for both databases', () => {
  it('numbers each ? in order for PostgreSQL', () => {
    expect(numberedPlaceholders('SELECT "a" FROM "T" WHERE "b" = ? AND "c" IN (?, ?)')).toBe('SELECT "a" FROM "T" WHERE "b" = $1 AND "c" IN ($2, $3)');
  });

  it("leaves a ? inside a quoted string or name alone", () => {
    expect(numberedPlaceholders(`SELECT '?' AS "wh?at", ? FROM "T" WHERE "x" = 'it''s ?' AND "y" = ?`)).toBe(`SELECT '?' AS "wh?at", $1 FROM "T" WHERE "x" = 'it''s ?' AND "y" = $2`);
  });

  it('numbers exactly as many parameters as there are ? outside quotes (property)', () => {
    fc.assert(
      fc.property(fc.array(fc.constantFrom('?', ' ', 'a', '"q?"', "'s?'"), { maxLength: 40 }), (parts) => {
        const text = parts.join('');
        const outside = parts.filter((p) => p === '?').length;
        const out = numberedPlaceholders(text);
        const numbers = [...out.matchAll(/\$(\d+)/g)].map((m) => Number(m[1]));
        expect(numbers).toEqual(Array.from({ length: outside }, (_, i) => i + 1));
      }),
    );
  });
});

describe('reading values the two drivers return differently', () => {
  it('reads SQLite 0/1 and PostgreSQL booleans alike', () => {
    expect([asBool(1), asBool(true), asBool(0), asBool(false), asBool(null)]).toEqual([true, true, false, false, false]);
  });

  it("reads SQLite's ISO text and PostgreSQL's Date as the same instant", () => {
    const d = new Date('2026-03-02T09:15:30.250Z');
    expect(asDate('2026-03-02T09:15:30.250+00:00').getTime()).toBe(d.getTime());
    expect(asDate(d)).toBe(d);
    expect(asDateOrNull(null)).toBeNull();
  });

  it('recognises a unique-key violation from better-sqlite3 and from node-postgres, and nothing else', () => {
    expect(isUniqueViolation({ code: 'SQLITE_CONSTRAINT_UNIQUE' })).toBe(true);
    expect(isUniqueViolation({ code: '23505' })).toBe(true);
    expect(isUniqueViolation({ code: 'SQLITE_BUSY' })).toBe(false);
    expect(isUniqueViolation(new Error('x'))).toBe(false);
  });
});

describe('statement building', () => {
  it('splits rows so no statement binds more parameters than the driver allows', () => {
    const rows = Array.from({ length: 25 }, (_, i) => [i, i, i]);
    const chunks = chunkRows(rows, 3, 30);
    expect(chunks.map((c) => c.length)).toEqual([10, 10, 5]);
    expect(chunks.flat()).toEqual(rows);
  });

  it('quotes plain names and refuses anything else', () => {
    expect(ident('caseId')).toBe('"caseId"');
    expect(() => ident('x"; DROP TABLE "Case')).toThrow(/not a plain SQL name/);
  });
});

describe('Mutex: one write transaction at a time on a SQLite connection', () => {
  it('runs critical sections one after another, in the order they asked', async () => {
    const m = new Mutex();
    const log: string[] = [];
    const section = (name: string, ms: number) =>
      m.run(async () => {
        log.push(`${name} in`);
        await new Promise((r) => setTimeout(r, ms));
        log.push(`${name} out`);
      });
    await Promise.all([section('a', 20), section('b', 1), section('c', 5)]);
    expect(log).toEqual(['a in', 'a out', 'b in', 'b out', 'c in', 'c out']);
  });

  it('frees the lock when a section throws', async () => {
    const m = new Mutex();
    await expect(m.run(async () => Promise.reject(new Error('boom')))).rejects.toThrow('boom');
    await expect(m.run(async () => 7)).resolves.toBe(7);
    expect(m.locked).toBe(false);
  });
});
