import { gammaQuantile } from './incompleteGamma';

/**
 * Exact (Garwood 1936) two-sided limits for a Poisson mean given an observed count k:
 * lower = χ²(α/2; 2k)/2 = Gamma(k) quantile α/2, upper = χ²(1 − α/2; 2k + 2)/2 =
 * Gamma(k + 1) quantile 1 − α/2. Lower is exactly 0 when k = 0.
 */
export function poissonCountLimits(k: number, confidence: number): { lower: number; upper: number } {
  const alpha = 1 - confidence;
  return {
    lower: k === 0 ? 0 : gammaQuantile(alpha / 2, k),
    upper: gammaQuantile(1 - alpha / 2, k + 1),
  };
}
