import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { createRng } from '@/lib/demo';

const draw = (seed: number | string, n = 20) => {
  const r = createRng(seed);
  return Array.from({ length: n }, () => r.next());
};

describe('the demo random generator', () => {
  it('gives the same numbers for the same seed, run after run', () => {
    expect(draw(42)).toEqual(draw(42));
    expect(draw('plateau')).toEqual(draw('plateau'));
  });

  it('gives different numbers for different seeds, and keeps 1 and "1" apart', () => {
    expect(draw(1)).not.toEqual(draw(2));
    expect(draw(1)).not.toEqual(draw('1'));
  });

  it('stays in [0, 1) and its integers include both ends of the range', () => {
    fc.assert(
      fc.property(fc.integer(), (seed) => {
        const r = createRng(seed);
        for (let i = 0; i < 200; i++) {
          const x = r.next();
          expect(x).toBeGreaterThanOrEqual(0);
          expect(x).toBeLessThan(1);
          const k = r.int(-2, 3);
          expect(Number.isInteger(k) && k >= -2 && k <= 3).toBe(true);
        }
      }),
      { numRuns: 50 },
    );
    const r = createRng(9);
    const seen = new Set(Array.from({ length: 500 }, () => r.int(1, 6)));
    expect([...seen].sort()).toEqual([1, 2, 3, 4, 5, 6]);
  });

  it('draws uniform, normal, Bernoulli and weighted values with the asked-for mean and spread', () => {
    const r = createRng('moments');
    const n = 40_000;
    const u = Array.from({ length: n }, () => r.uniform(10, 20));
    expect(u.reduce((a, b) => a + b, 0) / n).toBeCloseTo(15, 1);
    const z = Array.from({ length: n }, () => r.normal(5, 2));
    const mean = z.reduce((a, b) => a + b, 0) / n;
    const sd = Math.sqrt(z.reduce((a, b) => a + (b - mean) ** 2, 0) / (n - 1));
    expect(mean).toBeCloseTo(5, 1);
    expect(sd).toBeGreaterThan(1.95);
    expect(sd).toBeLessThan(2.05);
    // About 95 % within 1.96 SD: a check that the shape is normal, not only the moments.
    const within = z.filter((x) => Math.abs(x - 5) < 1.96 * 2).length / n;
    expect(within).toBeGreaterThan(0.94);
    expect(within).toBeLessThan(0.96);
    const b = Array.from({ length: n }, () => r.bernoulli(0.3)).filter(Boolean).length / n;
    expect(b).toBeGreaterThan(0.29);
    expect(b).toBeLessThan(0.31);
    const w = Array.from({ length: n }, () => r.weighted([['a', 1], ['b', 3], ['never', 0]] as const));
    expect(w.includes('never')).toBe(false);
    expect(w.filter((x) => x === 'b').length / n).toBeGreaterThan(0.74);
    expect(w.filter((x) => x === 'b').length / n).toBeLessThan(0.76);
  });

  it('forks a stream by label only, so what the parent drew before does not move the child', () => {
    const a = createRng(7);
    const b = createRng(7);
    for (let i = 0; i < 137; i++) b.next();
    const ca = a.fork('case:demo-0002');
    const cb = b.fork('case:demo-0002');
    expect(ca.key).toBe(cb.key);
    expect(Array.from({ length: 10 }, () => ca.next())).toEqual(Array.from({ length: 10 }, () => cb.next()));
    // Siblings and nested forks are distinct streams.
    expect(a.fork('case:demo-0001').next()).not.toBe(a.fork('case:demo-0002').next());
    expect(a.fork('x').fork('y').key).not.toBe(a.fork('y').fork('x').key);
  });

  it('shuffles into a permutation and refuses to pick from nothing', () => {
    const r = createRng(3);
    const xs = Array.from({ length: 30 }, (_, i) => i);
    const s = r.shuffle(xs);
    expect(s).not.toEqual(xs);
    expect([...s].sort((p, q) => p - q)).toEqual(xs);
    expect(() => r.pick([])).toThrow(/empty/);
    expect(() => r.weighted([['a', 0]])).toThrow(/no positive weight/);
  });
});
