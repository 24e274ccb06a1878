/**
 * The path of the first string in a parsed body that holds a NUL character (U+0000), or null.
 * PostgreSQL cannot store NUL in text, and no clinical text needs one: the edge refuses such
 * input by name instead of failing in the database (SQLite would have stored it).
 *
 * @example
 * nulCharacterAt({ entry: { note: 'a\u0000b' } }) //=> 'entry.note'
 * nulCharacterAt({ entry: { note: 'ab' } }) //=> null
 */
export function nulCharacterAt(value: unknown, path = ''): string | null {
  if (typeof value === 'string') return value.includes('\u0000') ? path || 'body' : null;
  if (Array.isArray(value)) {
    for (let i = 0; i < value.length; i++) {
      const p = nulCharacterAt(value[i], `${path}[${i}]`);
      if (p) return p;
    }
    return null;
  }
  if (value && typeof value === 'object') {
    for (const [k, v] of Object.entries(value)) {
      if (k.includes('\u0000')) return path ? `${path}.${k.replace(/\u0000/g, '\\0')}` : k.replace(/\u0000/g, '\\0');
      const p = nulCharacterAt(v, path ? `${path}.${k}` : k);
      if (p) return p;
    }
  }
  return null;
}
