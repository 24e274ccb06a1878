import type { StatsRow } from '@/lib/domain/statsRow';
import { ageBand, bmiBand, REGIMEN_LABEL, REGIMENS } from '@/lib/domain/regimen';
import { DEPTH_LABEL, DEPTHS, PROCEDURE_LABEL, ASA_CLASSES } from '@/lib/domain/caseFacts';
import { STOP_BANG_BAND_LABEL } from '@/lib/domain/stopBang';

/** What a review table can be broken down by. */
export const DIMENSIONS = ['procedure', 'regimen', 'asa', 'bmi', 'stopbang', 'age', 'depth', 'room', 'proceduralist', 'nurse'] as const;
export type DimensionId = (typeof DIMENSIONS)[number];

export const DIMENSION_LABEL: Record<DimensionId, string> = {
  procedure: 'Procedure',
  regimen: 'Sedation regimen',
  asa: 'ASA class',
  bmi: 'BMI band (kg/m²)',
  stopbang: 'STOP-Bang band',
  age: 'Age band (years)',
  depth: 'Planned depth',
  room: 'Room',
  proceduralist: 'Proceduralist',
  nurse: 'Sedation nurse',
};

/** The value a row takes on a dimension: a stable key (for URLs) and a label. Never absent: unknowns get a key of their own. */
export interface DimensionValue {
  key: string;
  label: string;
}

export const UNKNOWN = 'unknown';

const BMI_ORDER = ['< 18.5', '18.5–24.9', '25–29.9', '30–34.9', '35–39.9', '≥ 40', UNKNOWN];
const AGE_ORDER = ['< 18', '18–39', '40–59', '60–69', '70–79', '≥ 80', UNKNOWN];
const STOPBANG_ORDER = ['low', 'intermediate', 'high', UNKNOWN];

/**
 * The value of `row` on `dimension`. Bands are lib/domain/regimen's `bmiBand` and `ageBand`;
 * missing facts fall in `unknown` (or `none` for a case without a room, proceduralist or nurse).
 *
 * @example dimensionValue(row, 'asa') //=> { key: 'II', label: 'ASA II' }
 */
export function dimensionValue(row: StatsRow, dimension: DimensionId): DimensionValue {
  switch (dimension) {
    case 'procedure':
      return { key: row.procedureType, label: PROCEDURE_LABEL[row.procedureType] ?? row.procedureType };
    case 'regimen':
      return { key: row.regimen, label: REGIMEN_LABEL[row.regimen] };
    case 'asa':
      return row.asaClass ? { key: row.asaClass, label: `ASA ${row.asaClass}` } : { key: UNKNOWN, label: 'ASA not recorded' };
    case 'bmi': {
      const b = bmiBand(row.bmi);
      return { key: b, label: b === UNKNOWN ? 'BMI not known' : b };
    }
    case 'stopbang':
      return row.stopBangBand ? { key: row.stopBangBand, label: STOP_BANG_BAND_LABEL[row.stopBangBand] } : { key: UNKNOWN, label: 'STOP-Bang not answered' };
    case 'age': {
      const a = ageBand(row.ageYears);
      return { key: a, label: a === UNKNOWN ? 'Age not known' : a };
    }
    case 'depth':
      return { key: row.plannedDepth, label: DEPTH_LABEL[row.plannedDepth] ?? row.plannedDepth };
    case 'room':
      return row.roomId ? { key: row.roomId, label: row.room ?? row.roomId } : { key: 'none', label: 'No room' };
    case 'proceduralist':
      return row.proceduralistId ? { key: row.proceduralistId, label: row.proceduralist ?? row.proceduralistId } : { key: 'none', label: 'No proceduralist recorded' };
    case 'nurse':
      return row.nurseId ? { key: row.nurseId, label: row.nurse ?? row.nurseId } : { key: 'none', label: 'No nurse recorded' };
  }
}

/** Sort order of a dimension's values: natural order for bands and lists, else by label; unknown/none last. */
export function compareDimensionValues(dimension: DimensionId, a: DimensionValue, b: DimensionValue): number {
  const order: Partial<Record<DimensionId, readonly string[]>> = {
    bmi: BMI_ORDER,
    age: AGE_ORDER,
    stopbang: STOPBANG_ORDER,
    asa: [...ASA_CLASSES, UNKNOWN],
    depth: DEPTHS,
    regimen: REGIMENS,
  };
  const list = order[dimension];
  if (list) {
    const rank = (k: string) => (list.includes(k) ? list.indexOf(k) : list.length);
    return rank(a.key) - rank(b.key) || a.label.localeCompare(b.label);
  }
  const last = (k: string) => (k === UNKNOWN || k === 'none' ? 1 : 0);
  return last(a.key) - last(b.key) || a.label.localeCompare(b.label);
}
