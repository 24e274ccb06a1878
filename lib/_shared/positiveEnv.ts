/**
 * A positive number from an environment setting, else the default (integers only when asked):
 * a missing, empty, malformed, zero or negative setting falls back rather than half-working.
 *
 * @example
 * positiveEnv('45', 30) //=> 45
 * positiveEnv('-1', 30) //=> 30
 * positiveEnv('2.5', 10, true) //=> 10
 */
export function positiveEnv(v: string | undefined, dflt: number, integer = false): number {
  const n = v === undefined ? NaN : Number(v);
  return (integer ? Number.isInteger(n) : Number.isFinite(n)) && n > 0 ? n : dflt;
}
