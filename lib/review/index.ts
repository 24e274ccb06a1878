/**
 * The monthly review for the lead (issue 5), pure: figures over StatsRow[] (lib/domain/statsRow)
 * with intervals, monthly p charts, breakdowns, funnels, standardised ratios by room, the review
 * queue, drill-down filters and rule-set comparison. Methods: docs/review.md.
 */
export * from './proportion';
export * from './figures';
export * from './period';
export * from './quantileInterval';
export * from './apneaResponse';
export * from './headline';
export * from './dimensions';
export * from './breakdown';
export * from './monthlySeries';
export * from './funnel';
export * from './observedExpected';
export * from './reviewQueue';
export * from './compareReview';
export * from './caseFilter';
export * from './buildReview';
export * from './csvTables';
