/**
 * FHIR R4 SampledData for Plateau's monitor series: values on a regular grid from an origin, the
 * period in milliseconds, data as space-separated decimals with "E" where no value was observed
 * (a gap in the series, a probe-off or zero SpO2). The inverse is `decodeSampledData`.
 */

/** A series on a regular grid: `values[k]` is the value at `originT + k · periodS` (null = none). */
export interface SampledGrid {
  originT: number;
  periodS: number;
  values: (number | null)[];
}

/**
 * A decimal as FHIR wants it: no exponent, no trailing zeros, "-0" as "0".
 * @example fhirDecimal(5.3) //=> "5.3"
 * @example fhirDecimal(1e-7) //=> "0.0000001"
 */
export function fhirDecimal(x: number): string {
  if (Object.is(x, -0) || x === 0) return '0';
  const s = String(x);
  if (!/e/i.test(s)) return s;
  return x
    .toFixed(12)
    .replace(/0+$/, '')
    .replace(/\.$/, '');
}

/**
 * Put samples at times `t` on a grid of `periodS` from the first time: each sample goes to the
 * nearest grid slot (the first one wins a slot), slots without a sample are null. Assumes strictly
 * increasing times and a period that matches the sampling (the median interval).
 *
 * @example
 * toSampledGrid([10, 11, 13], [98, 97, 96], 1)
 * //=> { originT: 10, periodS: 1, values: [98, 97, null, 96] }
 */
export function toSampledGrid(t: number[], v: (number | null)[], periodS: number): SampledGrid {
  if (t.length === 0) return { originT: 0, periodS, values: [] };
  const originT = t[0];
  const last = Math.round((t[t.length - 1] - originT) / periodS);
  const values: (number | null)[] = new Array(last + 1).fill(null);
  const filled = new Uint8Array(last + 1);
  for (let i = 0; i < t.length; i++) {
    const k = Math.round((t[i] - originT) / periodS);
    if (filled[k] === 1) continue;
    filled[k] = 1;
    values[k] = v[i];
  }
  return { originT, periodS, values };
}

/** @example encodeSampledData([98, null, 97.5]) //=> "98 E 97.5" */
export function encodeSampledData(values: (number | null)[]): string {
  return values.map((x) => (x === null || !Number.isFinite(x) ? 'E' : fhirDecimal(x))).join(' ');
}

/**
 * The values of a SampledData `data` string; "E", "L" and "U" (error, below and above the
 * detection limit) become null.
 * @example decodeSampledData("98 E 97.5") //=> [98, null, 97.5]
 */
export function decodeSampledData(data: string): (number | null)[] {
  if (data.trim() === '') return [];
  return data
    .trim()
    .split(' ')
    .map((s) => (s === 'E' || s === 'L' || s === 'U' ? null : Number(s)));
}
