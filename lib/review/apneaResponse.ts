import { proportion, type Proportion } from './proportion';
import { quantileInterval, type QuantileEstimate } from './quantileInterval';
import type { SummarisedRow } from './figures';

export interface ApneaResponse {
  /** Cases with an apnea whose first apnea had a recorded response, of all cases with an apnea. */
  responded: Proportion;
  /** Cases with an apnea episode (rule `apnea`), of the cases reviewed. */
  casesWithApnea: number;
  /** First response to the first apnea, seconds: median and 90th percentile with 95 % limits. */
  median: QuantileEstimate;
  p90: QuantileEstimate;
  /** The response times the quantiles come from (s), in row order. */
  values: number[];
}

/**
 * Response time to apnea: for every case with an apnea (rule `apnea`), the time from the start
 * of its first apnea to the first intervention recorded in [start, end + 60 s]
 * (`summary.firstApneaResponseS`, rules.md §5). Cases whose first apnea had no intervention
 * have no response time; `responded` counts those that had one.
 *
 * @example
 * apneaResponse(rows).median.value //=> 24
 */
export function apneaResponse(rows: readonly SummarisedRow[]): ApneaResponse {
  const values: number[] = [];
  let withApnea = 0;
  for (const r of rows) {
    if ((r.summary.rules.apnea?.episodes ?? 0) === 0) continue;
    withApnea++;
    if (r.summary.firstApneaResponseS !== null) values.push(r.summary.firstApneaResponseS);
  }
  return {
    responded: proportion(values.length, withApnea),
    casesWithApnea: withApnea,
    median: quantileInterval(values, 0.5),
    p90: quantileInterval(values, 0.9),
    values,
  };
}
