import fs from 'node:fs';
import path from 'node:path';

/**
 * The TrueType fonts embedded in PDFs: DejaVu Sans from the npm package (always installed),
 * else Debian's fonts-dejavu-core. Read once per process.
 */
let cache: { font: Uint8Array; fontBold: Uint8Array } | null = null;

export function pdfFonts(): { font: Uint8Array; fontBold: Uint8Array } {
  if (cache) return cache;
  const dirs = [path.join(/*turbopackIgnore: true*/ process.cwd(), 'node_modules', 'dejavu-fonts-ttf', 'ttf'), '/usr/share/fonts/truetype/dejavu'];
  for (const dir of dirs) {
    const regular = path.join(dir, 'DejaVuSans.ttf');
    const bold = path.join(dir, 'DejaVuSans-Bold.ttf');
    if (fs.existsSync(regular) && fs.existsSync(bold)) {
      cache = { font: new Uint8Array(fs.readFileSync(regular)), fontBold: new Uint8Array(fs.readFileSync(bold)) };
      return cache;
    }
  }
  throw new Error('DejaVu Sans not found: run npm ci (dejavu-fonts-ttf) or install fonts-dejavu-core');
}
