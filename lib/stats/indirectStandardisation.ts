import { poissonCountLimits } from './_numeric/poissonCountLimits';
import { assertCounts, assertProbability } from './_shared/validate';
import type { ConfidenceOptions } from './types';

export interface StratumCount {
  /** Stratum key, e.g. 'ASA III / deep'. */
  stratum: string;
  x: number;
  n: number;
}

export type IndirectStandardisationOptions = ConfidenceOptions;

export interface StandardisedStratum {
  stratum: string;
  observed: number;
  n: number;
  /** x/n of the reference in this stratum. */
  referenceRate: number;
  /** n × referenceRate. */
  expected: number;
}

export interface IndirectStandardisation {
  observed: number;
  expected: number;
  /** Observed / expected (the standardised ratio, 1 = as the reference). */
  ratio: number;
  /** Exact Poisson limits on O, divided by E. */
  lower: number;
  upper: number;
  /** Strata that entered O and E, in the order the target lists them. */
  strataUsed: StandardisedStratum[];
  /** Target strata with no reference rate (absent from the reference, or reference n = 0): left out of O and E. */
  strataMissing: StratumCount[];
}

function sumByStratum(rows: readonly StratumCount[], name: string): Map<string, { x: number; n: number }> {
  const sums = new Map<string, { x: number; n: number }>();
  rows.forEach((r, i) => {
    assertCounts(`${name}[${i}].x`, r.x, `${name}[${i}].n`, r.n);
    const s = sums.get(r.stratum) ?? { x: 0, n: 0 };
    s.x += r.x;
    s.n += r.n;
    sums.set(r.stratum, s);
  });
  return sums;
}

/**
 * Indirect standardisation: the target's observed events against those expected if each
 * of its strata had the reference's rate, E = Σ n_target,s · x_ref,s / n_ref,s. The
 * interval is the exact (Garwood) Poisson interval for O divided by E, treating E as
 * fixed. Rows with the same stratum are added together. Target strata the reference
 * cannot rate are left out of both O and E and reported in `strataMissing`. E = 0 gives
 * ratio NaN (O = 0) or Infinity.
 *
 * @example
 * indirectStandardisation(
 *   [{ stratum: 'ASA I-II', x: 10, n: 1000 }, { stratum: 'ASA III+', x: 20, n: 500 }],
 *   [{ stratum: 'ASA I-II', x: 2, n: 100 }, { stratum: 'ASA III+', x: 6, n: 100 }],
 * )
 * //=> { observed: 8, expected: 5, ratio: 1.6, lower: 0.6908, upper: 3.1526, … } (rounded)
 */
export function indirectStandardisation(
  reference: readonly StratumCount[],
  target: readonly StratumCount[],
  options: IndirectStandardisationOptions = {},
): IndirectStandardisation {
  const confidence = options.confidence ?? 0.95;
  assertProbability('confidence', confidence);
  const ref = sumByStratum(reference, 'reference');
  const tgt = sumByStratum(target, 'target');
  const strataUsed: StandardisedStratum[] = [];
  const strataMissing: StratumCount[] = [];
  for (const [stratum, t] of tgt) {
    const r = ref.get(stratum);
    if (!r || r.n === 0) {
      strataMissing.push({ stratum, x: t.x, n: t.n });
      continue;
    }
    const referenceRate = r.x / r.n;
    strataUsed.push({ stratum, observed: t.x, n: t.n, referenceRate, expected: t.n * referenceRate });
  }
  const observed = strataUsed.reduce((s, r) => s + r.observed, 0);
  const expected = strataUsed.reduce((s, r) => s + r.expected, 0);
  const limits = poissonCountLimits(observed, confidence);
  return {
    observed,
    expected,
    ratio: observed / expected,
    lower: limits.lower / expected,
    upper: limits.upper / expected,
    strataUsed,
    strataMissing,
  };
}
