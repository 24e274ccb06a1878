/** PDF checks with Debian's poppler-utils: ink per rendered page, and the text read back. */
import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import { createRequire } from 'node:module';
import path from 'node:path';

const require = createRequire(import.meta.url);

/** DejaVu Sans bytes from the npm package, else Debian's fonts-dejavu-core. */
export function fontFile(name: string): Uint8Array {
  const candidates = [() => require.resolve(`dejavu-fonts-ttf/ttf/${name}`), () => `/usr/share/fonts/truetype/dejavu/${name}`];
  for (const c of candidates) {
    try {
      const p = c();
      if (fs.existsSync(p)) return new Uint8Array(fs.readFileSync(p));
    } catch {
      // try the next place
    }
  }
  throw new Error(`font ${name} not found: npm install (dejavu-fonts-ttf) or apt-get install fonts-dejavu-core`);
}

export function tool(name: string): string {
  for (const dir of ['/usr/bin', '/usr/local/bin']) if (fs.existsSync(path.join(dir, name))) return path.join(dir, name);
  throw new Error(`${name} is missing: apt-get install poppler-utils (.ci/run installs it)`);
}

/** A binary PGM (P5) file: width, height and the grey bytes. */
export function readPgm(file: string): { width: number; height: number; pixels: Uint8Array } {
  const buf = fs.readFileSync(file);
  const fields: string[] = [];
  let i = 0;
  while (fields.length < 4) {
    while (buf[i] === 0x23 || /\s/.test(String.fromCharCode(buf[i]))) {
      if (buf[i] === 0x23) while (buf[i] !== 0x0a) i++; // comment to end of line
      i++;
    }
    let tok = '';
    while (!/\s/.test(String.fromCharCode(buf[i]))) tok += String.fromCharCode(buf[i++]);
    fields.push(tok);
  }
  i++; // the single whitespace after maxval
  if (fields[0] !== 'P5') throw new Error(`not a binary PGM: ${fields[0]}`);
  const [width, height, maxval] = fields.slice(1).map(Number);
  if (maxval !== 255) throw new Error(`unexpected PGM maxval ${maxval}`);
  return { width, height, pixels: new Uint8Array(buf.subarray(i, i + width * height)) };
}

/** Share of pixels darker than 200 of 255 on each page (pdftoppm at 50 dpi, grey). */
export function inkPerPage(pdf: string, dir: string): number[] {
  const prefix = path.join(dir, path.basename(pdf, '.pdf'));
  execFileSync(tool('pdftoppm'), ['-r', '50', '-gray', pdf, prefix]);
  const pages = fs
    .readdirSync(dir)
    .filter((f) => f.startsWith(`${path.basename(prefix)}-`) && f.endsWith('.pgm'))
    .sort();
  return pages.map((f) => {
    const { pixels } = readPgm(path.join(dir, f));
    let dark = 0;
    for (const p of pixels) if (p < 200) dark++;
    return dark / pixels.length;
  });
}

export function pdftotext(pdf: string): string {
  return execFileSync(tool('pdftotext'), ['-layout', pdf, '-'], { encoding: 'utf8' });
}
