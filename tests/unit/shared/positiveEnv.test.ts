import { describe, expect, it } from 'vitest';
import { positiveEnv } from '@/lib/_shared/positiveEnv';

describe('positiveEnv: a number setting from the environment', () => {
  it('takes a positive value as written', () => {
    expect(positiveEnv('45', 30)).toBe(45);
    expect(positiveEnv('0.5', 30)).toBe(0.5);
  });

  it('falls back to the default for a missing, empty, malformed, zero or negative setting', () => {
    for (const v of [undefined, '', 'ten', '0', '-1', 'Infinity']) expect(positiveEnv(v, 30)).toBe(30);
  });

  it('asks for a whole number when told to (a pool of 2.5 connections is a typo)', () => {
    expect(positiveEnv('12', 10, true)).toBe(12);
    expect(positiveEnv('2.5', 10, true)).toBe(10);
  });
});
