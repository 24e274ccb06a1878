/**
 * Shapes shared by the control charts (`pChart`, `uChart`, `gChart`) and read by
 * `specialCauses`. Types only.
 */

/** One plotted point with its own limits (p and u charts have limits that vary with n). */
export interface ControlChartPoint {
  label: string;
  /** The plotted statistic: a proportion (p), a rate (u) or a count of cases between events (g). */
  value: number;
  centre: number;
  /** Lower control limit, floored at 0. */
  lcl: number;
  /** Upper control limit (capped at 1 on a p chart). */
  ucl: number;
  /** True when the point was left out of the centre-line estimate (revision or `exclude`). */
  excluded: boolean;
}

export interface ControlChart<P extends ControlChartPoint = ControlChartPoint> {
  kind: 'p' | 'u' | 'g';
  /** Centre line used for every point's limits (after revision, if any). */
  centre: number;
  /** Width of the limits in standard errors (3 unless asked otherwise). */
  sigma: number;
  points: P[];
}

/** Options shared by the p and u charts. */
export interface RatioChartOptions {
  /** Limit width in standard errors; default 3 (Shewhart). */
  sigma?: number;
  /**
   * One round of Montgomery's revision: points outside the first trial limits are left
   * out, and the centre line and every point's limits are recomputed from the rest.
   * Default false. The points stay on the chart, marked `excluded`.
   */
  revise?: boolean;
  /** Labels of points to leave out of the centre line from the start (known assignable causes). */
  exclude?: readonly string[];
}

/** What a p or u chart adds to the common chart shape. */
export interface RatioChartSummary {
  /** Centre line from the points before any revision (equal to `centre` when none was done). */
  trialCentre: number;
  /** Labels of the points left out of `centre`, in chart order. */
  excludedLabels: string[];
}
