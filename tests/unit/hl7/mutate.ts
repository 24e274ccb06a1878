/** Message mutations shared by the unit fuzz and its integration variant over a real database. */
import fc from 'fast-check';

export interface Mutation {
  kind: 'delete' | 'insert' | 'replace' | 'truncate' | 'swap';
  at?: number;
  len?: number;
  text?: string;
  a?: number;
  b?: number;
}

const alphabet = ['|', '^', '~', '\\', '&', '\r', '\n', 'A', '9', '.', '-', '+', ' ', 'MSH', 'OBX|', '\\F\\', '\x00', 'é'];

export const mutationArb: fc.Arbitrary<Mutation> = fc.oneof(
  fc.record({ kind: fc.constant('delete' as const), at: fc.nat(), len: fc.integer({ min: 1, max: 20 }) }),
  fc.record({ kind: fc.constant('insert' as const), at: fc.nat(), text: fc.constantFrom(...alphabet) }),
  fc.record({ kind: fc.constant('replace' as const), at: fc.nat(), text: fc.constantFrom(...alphabet) }),
  fc.record({ kind: fc.constant('truncate' as const), at: fc.nat() }),
  fc.record({ kind: fc.constant('swap' as const), a: fc.nat(), b: fc.nat() }),
);

export function mutate(text: string, ms: Mutation[]): string {
  let t = text;
  for (const m of ms) {
    const at = (m.at ?? 0) % (t.length + 1);
    if (m.kind === 'delete') t = t.slice(0, at) + t.slice(at + (m.len ?? 1));
    else if (m.kind === 'insert') t = t.slice(0, at) + m.text + t.slice(at);
    else if (m.kind === 'replace') t = t.slice(0, at) + m.text + t.slice(at + 1);
    else if (m.kind === 'truncate') t = t.slice(0, at);
    else {
      const segs = t.split('\r');
      const a = (m.a ?? 0) % segs.length;
      const b = (m.b ?? 0) % segs.length;
      [segs[a], segs[b]] = [segs[b], segs[a]];
      t = segs.join('\r');
    }
  }
  return t;
}
