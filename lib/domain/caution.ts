/** The caution every screen, note and report carries. */
export const CAUTION_TEXT =
  'Plateau documents and analyses; it is not an alarm and not a medical device. Thresholds follow local policy; clinical judgement and licensed practice decide; local regulations apply.';
