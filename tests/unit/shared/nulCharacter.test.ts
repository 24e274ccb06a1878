import { describe, expect, it } from 'vitest';
import { nulCharacterAt } from '@/lib/_shared/nulCharacter';

describe('nulCharacterAt: refusing text the second database cannot store', () => {
  it('names the field of the first string with a NUL, through objects and arrays', () => {
    expect(nulCharacterAt({ entry: { kind: 'dose', note: 'ok' }, tags: ['a', 'b\u0000'] })).toBe('tags[1]');
    expect(nulCharacterAt({ a: { b: [{ c: '\u0000' }] } })).toBe('a.b[0].c');
    expect(nulCharacterAt('x\u0000')).toBe('body');
  });

  it('finds a NUL in a key too', () => {
    expect(nulCharacterAt({ 'we\u0000ird': 1 })).toBe('we\\0ird');
  });

  it('passes bodies without one, including numbers, nulls and empty strings', () => {
    expect(nulCharacterAt({ a: 1, b: null, c: '', d: [true, 2.5, 'text with – unicode ✓'] })).toBeNull();
  });
});
