import type { Breath } from '@/lib/capnogram';
import type { TrueBreath } from '@/lib/capnogram';

/** Matches detected breaths to true ones by expiration start within `tolS`; precision, recall, F1. */
export function matchBreaths(found: Breath[], truth: TrueBreath[], tolS = 0.3) {
  const pairs: [Breath, TrueBreath][] = [];
  let j = 0;
  const used = new Set<number>();
  for (const t of truth) {
    while (j < found.length && found[j].expStartS < t.expStartS - tolS) j++;
    if (j < found.length && Math.abs(found[j].expStartS - t.expStartS) <= tolS && !used.has(j)) {
      used.add(j);
      pairs.push([found[j], t]);
      j++;
    }
  }
  const tp = pairs.length;
  const precision = found.length ? tp / found.length : 0;
  const recall = truth.length ? tp / truth.length : 0;
  const f1 = precision + recall ? (2 * precision * recall) / (precision + recall) : 0;
  return { pairs, tp, precision, recall, f1 };
}
