/** The fictional demo unit generator (docs/demo.md). Pure and deterministic: seeds and "now" come in as arguments. */
export { createRng, hashString, type Rng } from './random';
export * from './unit';
export * from './types';
export { generateDemoPatient, ageOn, bmiOf, type DemoPatient, type GenerateDemoPatientOptions } from './patient';
export { assessVisit, stopBangOf, asaNumber, type AssessVisitOptions } from './assessment';
export { REGIMEN_WEIGHTS, chooseRegimen, chooseDepth, planSedation, type CaseTimeline, type SedationPlan, type PlanSedationOptions } from './sedationPlan';
export {
  APNEA_BASE_P,
  HYPOVENTILATION_BASE_P,
  BRADYPNEA_BASE_P,
  PROLONGED_APNEA_SHARE,
  STANDALONE_DESATURATION_P,
  LINE_DISCONNECTION_P,
  PROBE_OFF_P,
  riskMultiplier,
  planRespiratoryEvents,
  type SignalEvent,
  type EventPlan,
  type PlanEventsOptions,
} from './respiratoryEvents';
export { DRUG_KINETICS, drawBaselines, drugEffect, synthesizeSignals, type Baselines, type SynthesizeOptions, type SynthesizedSignals } from './signals';
export { manualVitals, recoveryCourse, type RecoveryCourse } from './recovery';
export { generateDemoCase, type DemoCaseParams } from './generateCase';
export { generateDemoUnit, REPEAT_VISIT_SHARE, type DemoUnit, type GenerateDemoUnitOptions } from './generateUnit';
export { liveScenarioStream, LIVE_SCENARIOS, type LiveScenario, type LiveSample, type LiveScenarioOptions } from './liveScenario';
export { localDateOf, wallTimeAt, zonedWallTimeToUtc, zoneOffsetMinutes } from './zonedTime';
