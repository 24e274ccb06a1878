import fs from 'node:fs';
import { describe, expect, it } from 'vitest';
import { SCHEMA_PATH, schemaText } from '@/lib/db/migrationFiles';

const source = fs.readFileSync(SCHEMA_PATH, 'utf8');
const model = (schema: string, name: string) => schema.slice(schema.indexOf(`model ${name} {`), schema.indexOf('}', schema.indexOf(`model ${name} {`)));

describe('the PostgreSQL schema derived from the one schema source', () => {
  it('switches the provider and the client folder and keeps SQLite’s schema as written', () => {
    const pg = schemaText('postgresql', source);
    expect(schemaText('sqlite', source)).toBe(source);
    expect(pg).toMatch(/datasource db \{[^}]*provider\s*=\s*"postgresql"/);
    expect(pg).toMatch(/output\s*=\s*"\.\.\/\.\.\/lib\/db\/generated-pg"/);
  });

  it('widens the sample keys to 64 bits and no other key', () => {
    const pg = schemaText('postgresql', source);
    expect(model(pg, 'Sample')).toMatch(/\bid\s+BigInt\s+@id @default\(autoincrement\(\)\)/);
    expect(model(pg, 'Hl7InboxSample')).toMatch(/\bid\s+BigInt\s+@id @default\(autoincrement\(\)\)/);
    expect(model(pg, 'AuditEntry')).toMatch(/\bseq\s+Int\s+@id/);
    // Apart from the two keys, the models are the source's, line for line.
    const models = (s: string) => s.slice(s.indexOf('model ')).replace(/\bBigInt(\s+@id @default\(autoincrement\(\)\))/g, 'Int$1').replace(/ +/g, ' ');
    expect(models(pg)).toBe(models(source));
  });

  it('refuses a source whose provider is not SQLite, rather than derive a wrong schema', () => {
    expect(() => schemaText('postgresql', source.replace('provider = "sqlite"', 'provider = "mysql"'))).toThrow(/expected provider "sqlite"/);
  });
});
