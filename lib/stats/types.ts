/** A point estimate with its interval, on the estimate's own scale. */
export interface Interval {
  estimate: number;
  lower: number;
  upper: number;
}

/** Options shared by the interval functions. */
export interface ConfidenceOptions {
  /** Two-sided confidence level in (0, 1); default 0.95. */
  confidence?: number;
}
