/**
 * Opt-in check against the CapnoBase IEEE TBME respiratory-rate benchmark (Karlen W, Raman S,
 * Ansermino JM, Dumont GA 2013, "Multiparameter respiratory rate estimation from the
 * photoplethysmogram", IEEE Trans Biomed Eng 60:1946-53; 42 eight-minute recordings whose CO2
 * channel carries expert start-of-expiration labels). The data are not in the repository: place
 * the CSV export in tests/external/capnobase/ (docs/capnogram.md says which files). Without them
 * this test is skipped with a notice.
 *
 * File layout read here (from the CSV export's documentation, partly from memory):
 * `<id>_8min_signal.csv` with a `co2_y` column (mmHg, one row per sample),
 * `<id>_8min_param.csv` with `samplingrate_co2` (300 Hz when absent),
 * `<id>_8min_labels.csv` with `co2_startexp_x`: one-based sample numbers, space-separated in one
 * cell or one per row.
 */
import fs from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { analyzeCapnogram } from '@/lib/capnogram';

const DIR = path.resolve(__dirname, '..', '..', 'external', 'capnobase');
const ids = fs.existsSync(DIR) ? fs.readdirSync(DIR).filter((f) => f.endsWith('_signal.csv')).map((f) => f.replace(/_signal\.csv$/, '')).sort() : [];
if (!ids.length) console.warn(`[capnobase] skipped: no *_signal.csv in ${DIR} (see docs/capnogram.md, "CapnoBase check")`);

function readCsv(file: string): { header: string[]; rows: string[][] } {
  const lines = fs.readFileSync(file, 'utf8').split(/\r?\n/).filter((l) => l.trim() !== '');
  const split = (l: string) => l.split(',').map((c) => c.trim().replace(/^"|"$/g, ''));
  return { header: split(lines[0]).map((h) => h.toLowerCase()), rows: lines.slice(1).map(split) };
}
function column(file: string, pattern: RegExp): string[] {
  const { header, rows } = readCsv(file);
  const i = header.findIndex((h) => pattern.test(h));
  if (i < 0) throw new Error(`${path.basename(file)}: no column matching ${pattern}`);
  return rows.map((r) => r[i] ?? '').filter((c) => c !== '');
}

describe.skipIf(!ids.length)('CapnoBase respiratory-rate benchmark (opt-in)', () => {
  it('prints breath-detection sensitivity, PPV and RR error per recording', () => {
    const lines: string[] = [];
    let tpAll = 0, fnAll = 0, fpAll = 0;
    for (const id of ids) {
      const paramFile = path.join(DIR, `${id}_param.csv`);
      const rate = fs.existsSync(paramFile) ? Number(column(paramFile, /samplingrate_co2/)[0]) || 300 : 300;
      const v = Float32Array.from(column(path.join(DIR, `${id}_signal.csv`), /^co2_y$|co2/), Number);
      const labels = column(path.join(DIR, `${id}_labels.csv`), /co2_startexp/).flatMap((c) => c.split(/\s+/)).filter(Boolean).map((x) => (Number(x) - 1) / rate).sort((a, b) => a - b);
      const r = analyzeCapnogram([{ t0S: 0, rateHz: rate, v }]);
      const found = r.breaths.map((b) => b.expStartS);
      // A label is detected when a breath starts within 0.5 s of it (each breath used once).
      let tp = 0, j = 0;
      for (const t of labels) {
        while (j < found.length && found[j] < t - 0.5) j++;
        if (j < found.length && Math.abs(found[j] - t) <= 0.5) { tp++; j++; }
      }
      const fn = labels.length - tp, fp = found.length - tp;
      tpAll += tp; fnAll += fn; fpAll += fp;
      const durMin = v.length / rate / 60;
      const rrErr = Math.abs(found.length / durMin - labels.length / durMin);
      lines.push(`${id}: labels ${labels.length}, found ${found.length}, sensitivity ${(tp / labels.length).toFixed(3)}, PPV ${(tp / Math.max(1, found.length)).toFixed(3)}, mean RR error ${rrErr.toFixed(2)} /min`);
    }
    lines.push(`all: sensitivity ${(tpAll / (tpAll + fnAll)).toFixed(3)}, PPV ${(tpAll / Math.max(1, tpAll + fpAll)).toFixed(3)}`);
    console.log(lines.join('\n'));
    expect(tpAll).toBeGreaterThan(0);
  });
});
