/** Plateau statistics: proportions and rates with intervals, control charts, funnel plots, standardisation. Pure. */
export type { Interval, ConfidenceOptions } from './types';
export { wilsonInterval, type WilsonIntervalOptions } from './wilsonInterval';
export { wilsonCcInterval, type WilsonCcIntervalOptions } from './wilsonCcInterval';
export { clopperPearsonInterval, type ClopperPearsonIntervalOptions } from './clopperPearsonInterval';
export { poissonRateInterval, type PoissonRateInterval, type PoissonRateIntervalOptions } from './poissonRateInterval';
export { newcombeDifference, type NewcombeDifferenceOptions } from './newcombeDifference';
export { ruleOfThree } from './ruleOfThree';
export { zeroEventUpperBound, type ZeroEventUpperBoundOptions } from './zeroEventUpperBound';
export type { ControlChart, ControlChartPoint, RatioChartOptions, RatioChartSummary } from './controlChart';
export { pChart, type PChart, type PChartInput, type PChartOptions, type PChartPoint } from './pChart';
export { uChart, type UChart, type UChartInput, type UChartOptions, type UChartPoint } from './uChart';
export { gChart, type GChart, type GChartLimits, type GChartOptions } from './gChart';
export {
  casesBetweenEvents,
  type CaseEventFlag,
  type CasesBetweenEvents,
  type CasesBetweenEventsOptions,
} from './casesBetweenEvents';
export { specialCauses, type SpecialCausePoint, type SpecialCauseRule, type SpecialCausesOptions } from './specialCauses';
export { funnelLimits, type FunnelLimit, type FunnelLimitsOptions } from './funnelLimits';
export {
  funnelPlot,
  type FunnelPlot,
  type FunnelPlotOptions,
  type FunnelUnit,
  type FunnelUnitInput,
  type FunnelUnitLimit,
} from './funnelPlot';
export { overdispersionFactor, type OverdispersionFactorOptions } from './overdispersionFactor';
export {
  indirectStandardisation,
  type IndirectStandardisation,
  type IndirectStandardisationOptions,
  type StandardisedStratum,
  type StratumCount,
} from './indirectStandardisation';
export { quantile } from './quantile';
export { median } from './median';
