/**
 * Argument checks shared by the stats modules. The public functions are pure and expect
 * valid counts; these checks turn a programming error into a RangeError that names the
 * argument instead of a silent NaN.
 */
export function assertCount(name: string, value: number): void {
  if (!Number.isInteger(value) || value < 0) {
    throw new RangeError(`${name} must be a whole number ≥ 0 (got ${value})`);
  }
}

export function assertCounts(xName: string, x: number, nName: string, n: number): void {
  assertCount(xName, x);
  assertCount(nName, n);
  if (x > n) throw new RangeError(`${xName} must not exceed ${nName} (got ${x} of ${n})`);
}

export function assertProbability(name: string, value: number, open = true): void {
  const ok = open ? value > 0 && value < 1 : value >= 0 && value <= 1;
  if (!ok) {
    throw new RangeError(`${name} must lie in ${open ? '(0, 1)' : '[0, 1]'} (got ${value})`);
  }
}

export function assertPositive(name: string, value: number): void {
  if (!(value > 0) || !Number.isFinite(value)) {
    throw new RangeError(`${name} must be a finite number > 0 (got ${value})`);
  }
}

export function assertNonNegative(name: string, value: number): void {
  if (!(value >= 0) || !Number.isFinite(value)) {
    throw new RangeError(`${name} must be a finite number ≥ 0 (got ${value})`);
  }
}
