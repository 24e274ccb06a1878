import fs from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { ACCESS, PUBLIC_ROUTES } from '@/lib/server/policy';
import { ROLES } from '@/lib/server/roles';

const APP = path.resolve(__dirname, '..', '..', '..', 'app');

/** Every page.tsx and route.ts under app/, as the URL pattern Next serves it at. */
function routes(): { file: string; pattern: string; kind: 'page' | 'route'; methods: string[] }[] {
  const out: { file: string; pattern: string; kind: 'page' | 'route'; methods: string[] }[] = [];
  const walk = (dir: string) => {
    for (const e of fs.readdirSync(dir, { withFileTypes: true })) {
      const p = path.join(dir, e.name);
      if (e.isDirectory()) walk(p);
      else if (e.name === 'page.tsx' || e.name === 'route.ts') {
        const rel = path.relative(APP, path.dirname(p)).split(path.sep).filter((s) => s && !/^\(.*\)$/.test(s));
        const pattern = '/' + rel.join('/');
        const src = fs.readFileSync(p, 'utf8');
        const methods = [...src.matchAll(/export async function (GET|POST|PUT|PATCH|DELETE)\b/g)].map((m) => m[1]);
        out.push({ file: path.relative(APP, p), pattern, kind: e.name === 'page.tsx' ? 'page' : 'route', methods });
      }
    }
  };
  walk(APP);
  return out;
}

describe('the access table', () => {
  const all = routes();
  const publicSet = new Set<string>(PUBLIC_ROUTES);

  it('finds the app routes to check', () => {
    expect(all.length).toBeGreaterThan(10);
  });

  for (const r of all) {
    const keys = r.kind === 'page' ? [r.pattern] : r.methods.map((m) => `${m} ${r.pattern}`);
    for (const key of keys) {
      it(`covers ${key} (${r.file}) and the file checks it`, () => {
        const src = fs.readFileSync(path.join(APP, r.file), 'utf8');
        if (publicSet.has(key)) {
          expect(src).not.toMatch(/requireAccess|authorizeApi/);
          return;
        }
        expect(Object.keys(ACCESS), `${key} is missing from lib/server/policy.ts`).toContain(key);
        const call = r.kind === 'page' ? `requireAccess('${key}')` : `authorizeApi('${key}')`;
        expect(src, `${r.file} must call ${call}`).toContain(call);
      });
    }
  }

  it('names only real roles, and no entry is left without a route', () => {
    const keys = new Set(all.flatMap((r) => (r.kind === 'page' ? [r.pattern] : r.methods.map((m) => `${m} ${r.pattern}`))));
    for (const [key, roles] of Object.entries(ACCESS)) {
      expect(keys.has(key), `${key} has no route`).toBe(true);
      for (const role of roles) expect(ROLES).toContain(role);
    }
  });

  it('keeps admin pages to admins and case writes away from the safety role', () => {
    expect(ACCESS['/admin']).toEqual(['admin']);
    for (const [key, roles] of Object.entries(ACCESS)) {
      if (/^(POST|PUT|PATCH|DELETE) \/api\/v1\/cases/.test(key)) expect(roles, key).not.toContain('safety');
    }
  });
});
