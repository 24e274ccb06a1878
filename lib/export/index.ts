/** Exports (pure): the FHIR R4 bundle of a case and its SampledData helpers. */
export {
  caseToFhirBundle,
  fhirId,
  base64Utf8,
  CHANNEL_LOINC,
  SAMPLE_UNIT_UCUM,
  DOSE_UNIT_UCUM,
  LOINC,
  UCUM,
  PLATEAU_RULE_SYSTEM,
  PLATEAU_RULE_SET_SYSTEM,
  PLATEAU_LEVEL_SYSTEM,
  PLATEAU_INTERVENTION_SYSTEM,
  PLATEAU_FIELD_SYSTEM,
  PLATEAU_CASE_SYSTEM,
  type FhirIds,
  type CaseToFhirInput,
} from './fhir';
export { toSampledGrid, encodeSampledData, decodeSampledData, fhirDecimal, type SampledGrid } from './sampledData';
