/**
 * A small seeded pseudo-random generator for the fictional demo unit.
 *
 * sfc32 (Chris Doty-Humphrey's "small fast counting" generator, 128-bit state) seeded from a
 * cyrb53-style string hash. Every stream has a `key`; `fork(label)` derives a child stream from
 * the parent's key and the label only — never from how many numbers the parent has drawn — so
 * generating one case differently never shifts the numbers of another.
 *
 * Not for cryptography. Deterministic across platforms: only 32-bit integer arithmetic
 * (`Math.imul`, `>>>`) and IEEE doubles are used.
 */

export interface Rng {
  /** The stream's identity (hex), derived from the seed and the fork path. */
  readonly key: string;
  /**
   * Uniform in [0, 1).
   * @example createRng(1).next() //=> a number in [0, 1), the same one every run
   */
  next(): number;
  /** Uniform in [min, max). */
  uniform(min: number, max: number): number;
  /** Normal (Box–Muller; the second value of each pair is kept for the next call). */
  normal(mean?: number, sd?: number): number;
  /** Normal clipped to [min, max] (clipped, not resampled: cheap and deterministic). */
  normalClipped(mean: number, sd: number, min: number, max: number): number;
  /** Integer uniform in [min, max], both inclusive. @example rng.int(1, 6) //=> 1..6 */
  int(min: number, max: number): number;
  /** True with probability p. */
  bernoulli(p: number): boolean;
  /** One element, uniformly. Throws on an empty list. */
  pick<T>(items: readonly T[]): T;
  /**
   * One value by weight. Weights need not sum to 1; zero weights are never picked.
   * @example rng.weighted([['I', 1], ['II', 3]]) //=> 'II' three times in four
   */
  weighted<T>(choices: readonly (readonly [T, number])[]): T;
  /** A shuffled copy (Fisher–Yates). */
  shuffle<T>(items: readonly T[]): T[];
  /**
   * An independent stream named by `label`, a pure function of (this stream's key, label).
   * @example createRng(7).fork('case:demo-0001').key === createRng(7).fork('case:demo-0001').key //=> true
   */
  fork(label: string): Rng;
}

/** cyrb53-style hash of a string into two 32-bit halves. */
export function hashString(str: string, seed = 0): [number, number] {
  let h1 = 0xdeadbeef ^ seed;
  let h2 = 0x41c6ce57 ^ seed;
  for (let i = 0; i < str.length; i++) {
    const ch = str.charCodeAt(i);
    h1 = Math.imul(h1 ^ ch, 2654435761);
    h2 = Math.imul(h2 ^ ch, 1597334677);
  }
  h1 = Math.imul(h1 ^ (h1 >>> 16), 2246822507);
  h1 ^= Math.imul(h2 ^ (h2 >>> 13), 3266489909);
  h2 = Math.imul(h2 ^ (h2 >>> 16), 2246822507);
  h2 ^= Math.imul(h1 ^ (h1 >>> 13), 3266489909);
  return [h1 >>> 0, h2 >>> 0];
}

function splitmix32(x: number): number {
  let z = (x + 0x9e3779b9) | 0;
  z = Math.imul(z ^ (z >>> 16), 0x85ebca6b);
  z = Math.imul(z ^ (z >>> 13), 0xc2b2ae35);
  return (z ^ (z >>> 16)) >>> 0;
}

function hex8(n: number): string {
  return (n >>> 0).toString(16).padStart(8, '0');
}

class Sfc32 implements Rng {
  readonly key: string;
  private a: number;
  private b: number;
  private c: number;
  private d: number;
  private spare: number | null = null;

  constructor(h1: number, h2: number) {
    this.key = hex8(h1) + hex8(h2);
    this.a = splitmix32(h1);
    this.b = splitmix32(h2);
    this.c = splitmix32(h1 ^ 0x5bd1e995);
    this.d = 1; // the counter
    for (let i = 0; i < 15; i++) this.nextUint32();
  }

  private nextUint32(): number {
    const t = (((this.a + this.b) | 0) + this.d) | 0;
    this.d = (this.d + 1) | 0;
    this.a = this.b ^ (this.b >>> 9);
    this.b = (this.c + (this.c << 3)) | 0;
    this.c = (this.c << 21) | (this.c >>> 11);
    this.c = (this.c + t) | 0;
    return t >>> 0;
  }

  next(): number {
    return this.nextUint32() / 4294967296;
  }

  uniform(min: number, max: number): number {
    return min + (max - min) * this.next();
  }

  normal(mean = 0, sd = 1): number {
    if (this.spare !== null) {
      const z = this.spare;
      this.spare = null;
      return mean + sd * z;
    }
    let u = this.next();
    while (u === 0) u = this.next();
    const v = this.next();
    const r = Math.sqrt(-2 * Math.log(u));
    this.spare = r * Math.sin(2 * Math.PI * v);
    return mean + sd * r * Math.cos(2 * Math.PI * v);
  }

  normalClipped(mean: number, sd: number, min: number, max: number): number {
    return Math.min(max, Math.max(min, this.normal(mean, sd)));
  }

  int(min: number, max: number): number {
    return min + Math.floor(this.next() * (max - min + 1));
  }

  bernoulli(p: number): boolean {
    return this.next() < p;
  }

  pick<T>(items: readonly T[]): T {
    if (items.length === 0) throw new Error('pick: empty list');
    return items[Math.floor(this.next() * items.length)];
  }

  weighted<T>(choices: readonly (readonly [T, number])[]): T {
    let total = 0;
    for (const [, w] of choices) total += Math.max(0, w);
    if (!(total > 0)) throw new Error('weighted: no positive weight');
    let x = this.next() * total;
    for (const [value, w] of choices) {
      if (w <= 0) continue;
      x -= w;
      if (x < 0) return value;
    }
    // Floating-point leftovers: the last positive choice.
    for (let i = choices.length - 1; i >= 0; i--) if (choices[i][1] > 0) return choices[i][0];
    throw new Error('weighted: unreachable');
  }

  shuffle<T>(items: readonly T[]): T[] {
    const out = items.slice();
    for (let i = out.length - 1; i > 0; i--) {
      const j = Math.floor(this.next() * (i + 1));
      const tmp = out[i];
      out[i] = out[j];
      out[j] = tmp;
    }
    return out;
  }

  fork(label: string): Rng {
    const [h1, h2] = hashString(`${this.key}/${label}`);
    return new Sfc32(h1, h2);
  }
}

/**
 * A seeded stream. Numbers and strings are distinct seeds (`1` and `'1'` differ).
 * @example createRng('plateau-demo').int(1, 6) //=> the same die roll every run
 */
export function createRng(seed: number | string): Rng {
  const [h1, h2] = hashString(typeof seed === 'number' ? `n:${seed}` : `s:${seed}`);
  return new Sfc32(h1, h2);
}
