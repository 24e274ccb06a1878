/**
 * The case note (pure): `composeNote` turns a CaseRecord, its Analysis and the database facts into
 * structured sections and plain text; `diffNotes` compares two versions; `coSignatureNeeded` says
 * when a second signature is required; `chartDataFromCase` feeds the PDF chart. The PDF itself is
 * `renderNotePdf` in `@/lib/note/pdf` (kept out of this index: it pulls in pdfkit).
 */
export { composeNote } from './composeNote';
export { renderNoteText } from './noteText';
export { diffNotes, diffLines, type NoteDiff, type NoteDiffLine, type DiffOp } from './diffNotes';
export { coSignatureNeeded } from './coSignature';
export { chartDataFromCase, type ChartDataOptions } from './chartData';
export { drugTotals, drugInfo } from './drugTotals';
export { findDataGaps, observedTimes, type GapSpan } from './monitoring';
export { ruleLabel, RULE_LABEL, CHANNEL_LABEL, CASE_LEVEL_LABEL, CASE_LEVEL_MEANING, ABRUPT_APNEA_HINT, CONFIRM_INTERVENTIONS_REQUEST } from './labels';
export * from './format';
export type * from './types';
