import type { CaseNote } from './types';

export type DiffOp = 'added' | 'removed' | 'unchanged';

export interface NoteDiffLine {
  op: DiffOp;
  text: string;
  /** 1-based line number in the older text (null for an added line). */
  lineA: number | null;
  /** 1-based line number in the newer text (null for a removed line). */
  lineB: number | null;
}

export interface NoteDiff {
  fromVersion: number;
  toVersion: number;
  lines: NoteDiffLine[];
  added: number;
  removed: number;
  unchanged: number;
}

/**
 * Line-level diff of two texts: a longest common subsequence of lines after trimming the common
 * head and tail, removed lines before added ones at each change. Quadratic in the changed middle,
 * which for two versions of one note is a few dozen lines.
 *
 * @example
 * diffLines('a\nb\nc', 'a\nc\nd').map((l) => `${l.op[0]} ${l.text}`)
 * //=> ['u a', 'r b', 'u c', 'a d']
 */
export function diffLines(a: string, b: string): NoteDiffLine[] {
  const A = a.split('\n');
  const B = b.split('\n');
  let head = 0;
  while (head < A.length && head < B.length && A[head] === B[head]) head++;
  let tail = 0;
  while (tail < A.length - head && tail < B.length - head && A[A.length - 1 - tail] === B[B.length - 1 - tail]) tail++;
  const a0 = A.slice(head, A.length - tail);
  const b0 = B.slice(head, B.length - tail);
  const n = a0.length;
  const m = b0.length;
  // lcs[i][j] = LCS length of a0[i..] and b0[j..]
  const lcs: Uint32Array[] = Array.from({ length: n + 1 }, () => new Uint32Array(m + 1));
  for (let i = n - 1; i >= 0; i--) {
    for (let j = m - 1; j >= 0; j--) {
      lcs[i][j] = a0[i] === b0[j] ? lcs[i + 1][j + 1] + 1 : Math.max(lcs[i + 1][j], lcs[i][j + 1]);
    }
  }
  const out: NoteDiffLine[] = [];
  for (let k = 0; k < head; k++) out.push({ op: 'unchanged', text: A[k], lineA: k + 1, lineB: k + 1 });
  let i = 0;
  let j = 0;
  while (i < n || j < m) {
    if (i < n && j < m && a0[i] === b0[j]) {
      out.push({ op: 'unchanged', text: a0[i], lineA: head + i + 1, lineB: head + j + 1 });
      i++;
      j++;
    } else if (i < n && (j >= m || lcs[i + 1][j] >= lcs[i][j + 1])) {
      out.push({ op: 'removed', text: a0[i], lineA: head + i + 1, lineB: null });
      i++;
    } else {
      out.push({ op: 'added', text: b0[j], lineA: null, lineB: head + j + 1 });
      j++;
    }
  }
  for (let k = tail; k > 0; k--) out.push({ op: 'unchanged', text: A[A.length - k], lineA: A.length - k + 1, lineB: B.length - k + 1 });
  return out;
}

/**
 * What changed in the text between two versions of a note (an amendment against the signed note).
 *
 * @example
 * diffNotes(v1, v2).lines.filter((l) => l.op !== 'unchanged').map((l) => `${l.op} ${l.text}`)
 * //=> ['removed Version 1; 2 Mar 2026; times in Europe/Dublin', 'added Version 2; 2 Mar 2026; times in Europe/Dublin', …]
 */
export function diffNotes(a: CaseNote, b: CaseNote): NoteDiff {
  const lines = diffLines(a.text, b.text);
  let added = 0;
  let removed = 0;
  let unchanged = 0;
  for (const l of lines) {
    if (l.op === 'added') added++;
    else if (l.op === 'removed') removed++;
    else unchanged++;
  }
  return { fromVersion: a.version, toVersion: b.version, lines, added, removed, unchanged };
}
