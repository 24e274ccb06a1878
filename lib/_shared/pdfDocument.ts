import PDFDocument from 'pdfkit';

export interface PdfDocumentOptions {
  size: 'A4' | 'LETTER';
  margin: number;
  /** TrueType bytes, passed in: pure modules never read files. */
  font: Uint8Array;
  fontBold?: Uint8Array;
  info: { Title: string; Subject: string; Author?: string };
  /** Creation date written into the file, so the same input gives the same bytes. */
  stamp: Date;
}

/**
 * A pdfkit document with Plateau's fonts registered as 'body' and 'bold' (the TrueType font is
 * the document's first font, so no built-in AFM font is ever loaded), buffered pages for
 * "page n of m" footers, and `finish()` that ends it and returns the bytes.
 * @example const { doc, finish } = openPdf({ size: 'A4', margin: 40, font, info, stamp }); doc.text('x'); await finish() //=> Uint8Array starting "%PDF-"
 */
export function openPdf(o: PdfDocumentOptions): { doc: PDFKit.PDFDocument; finish(): Promise<Uint8Array> } {
  const doc = new PDFDocument({
    size: o.size,
    margins: { top: o.margin, bottom: o.margin, left: o.margin, right: o.margin },
    bufferPages: true,
    font: o.font as unknown as string,
    info: { ...o.info, Creator: 'Plateau', Producer: 'Plateau (pdfkit)', CreationDate: o.stamp, ModDate: o.stamp },
  });
  doc.registerFont('body', o.font as unknown as string);
  doc.registerFont('bold', (o.fontBold ?? o.font) as unknown as string);
  const chunks: Uint8Array[] = [];
  const done = new Promise<void>((resolve, reject) => {
    doc.on('data', (c: Uint8Array) => chunks.push(c));
    doc.on('end', () => resolve());
    doc.on('error', (e: unknown) => reject(e));
  });
  return {
    doc,
    async finish() {
      doc.end();
      await done;
      let n = 0;
      for (const c of chunks) n += c.length;
      const out = new Uint8Array(n);
      let off = 0;
      for (const c of chunks) {
        out.set(c, off);
        off += c.length;
      }
      return out;
    },
  };
}
