export interface CaseEventFlag {
  /** When the case happened: a Date or an ISO 8601 string. */
  at: Date | string;
  /** True when the case had the event (several events in one case count once). */
  event: boolean;
}

export interface CasesBetweenEventsOptions {
  /**
   * Count the cases before the first event as the first gap (default true). Valid for a
   * geometric process observed from an arbitrary start; set false to start counting at
   * the first event.
   */
  countFromStart?: boolean;
}

export interface CasesBetweenEvents {
  /** Cases without the event between consecutive events: the g values, in time order. */
  gaps: number[];
  /** The time of the event that closed each gap, as an ISO 8601 string. */
  labels: string[];
  /** Event-free cases after the last event: an open gap, not yet a g value. */
  sinceLastEvent: number;
}

/**
 * Turns a list of cases with event flags into g values (cases between events) for
 * `gChart`. Cases are ordered by time first (stable for equal times). Throws RangeError
 * on an unparseable date.
 *
 * @example
 * casesBetweenEvents([
 *   { at: '2024-01-02', event: false }, { at: '2024-01-03', event: true },
 *   { at: '2024-01-05', event: true }, { at: '2024-01-07', event: false },
 * ])
 * //=> { gaps: [1, 0], labels: ['2024-01-03T00:00:00.000Z', '2024-01-05T00:00:00.000Z'], sinceLastEvent: 1 }
 */
export function casesBetweenEvents(
  cases: readonly CaseEventFlag[],
  options: CasesBetweenEventsOptions = {},
): CasesBetweenEvents {
  const countFromStart = options.countFromStart ?? true;
  const timed = cases.map((c, i) => {
    const t = c.at instanceof Date ? c.at.getTime() : Date.parse(c.at);
    if (Number.isNaN(t)) throw new RangeError(`cases[${i}].at: not a valid date (${String(c.at)})`);
    return { t, i, event: c.event };
  });
  timed.sort((a, b) => a.t - b.t || a.i - b.i);
  const gaps: number[] = [];
  const labels: string[] = [];
  let run = 0;
  let seenEvent = false;
  for (const c of timed) {
    if (c.event) {
      if (seenEvent || countFromStart) {
        gaps.push(run);
        labels.push(new Date(c.t).toISOString());
      }
      seenEvent = true;
      run = 0;
    } else {
      run += 1;
    }
  }
  return { gaps, labels, sinceLastEvent: run };
}
