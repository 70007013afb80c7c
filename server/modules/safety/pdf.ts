import PDFDocument from 'pdfkit';
import { createRequire } from 'node:module';

const require = createRequire(import.meta.url);
// The product's own typeface, from the bundled font package (no network, no system fonts).
const FONT_REGULAR = require.resolve('@fontsource/roboto-condensed/files/roboto-condensed-latin-400-normal.woff');
const FONT_BOLD = require.resolve('@fontsource/roboto-condensed/files/roboto-condensed-latin-700-normal.woff');

export const COLORS = {
  steel900: '#1e2730',
  steel700: '#38434e',
  steel500: '#5d6b78',
  steel200: '#cdd4db',
  steel100: '#e6eaee',
  danger: '#b91c1c',
  caution: '#f2b705',
  mandatory: '#1d4ed8',
  safe: '#15803d',
};

/** The latin subset of the font has no math signs; keep PDF text inside it. */
export const pdfText = (s: string) =>
  s
    .replace(/≥/g, '>=')
    .replace(/≤/g, '<=')
    .replace(/→/g, '->')
    // eslint-disable-next-line no-control-regex -- the range starts at U+0000 on purpose: everything outside the font is replaced
    .replace(/[^\u0000-\u024F\u2010-\u2027\u2030-\u203A\u20AC]/g, '?');

export function newDoc(info: { Title: string; Subject?: string }, layout: 'portrait' | 'landscape' = 'portrait') {
  const doc = new PDFDocument({ size: 'A4', layout, margin: 36, bufferPages: true, info: { ...info, Creator: 'Kerfbook', Producer: 'Kerfbook' } });
  doc.registerFont('regular', FONT_REGULAR);
  doc.registerFont('bold', FONT_BOLD);
  doc.font('regular');
  return doc;
}

export function toBuffer(doc: PDFKit.PDFDocument): Promise<Buffer> {
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = [];
    doc.on('data', (c: Buffer) => chunks.push(c));
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
    doc.end();
  });
}

/** Caution box: yellow bar (ISO 3864-1 caution) and the text. Returns the y below it. */
export function cautionBox(doc: PDFKit.PDFDocument, text: string, x: number, y: number, width: number): number {
  doc.font('regular').fontSize(8.5);
  const h = doc.heightOfString(pdfText(text), { width: width - 22 }) + 16;
  doc.rect(x, y, width, h).fill('#fff6d6');
  doc.rect(x, y, 6, h).fill(COLORS.caution);
  doc
    .fillColor(COLORS.steel900)
    .font('bold')
    .fontSize(8.5)
    .text('Safety: ', x + 14, y + 8, { continued: true, width: width - 22 })
    .font('regular')
    .text(pdfText(text));
  return y + h;
}

/** Page numbers and a footer line on every buffered page. */
export function stampPages(doc: PDFKit.PDFDocument, footer: string) {
  const range = doc.bufferedPageRange();
  for (let i = range.start; i < range.start + range.count; i++) {
    doc.switchToPage(i);
    const bottom = doc.page.height - 24;
    doc.font('regular').fontSize(7.5).fillColor(COLORS.steel500);
    doc.text(pdfText(footer), 36, bottom, { width: doc.page.width - 140, lineBreak: false, height: 10 });
    doc.text(`Page ${i - range.start + 1} of ${range.count}`, doc.page.width - 136, bottom, { width: 100, align: 'right', lineBreak: false, height: 10 });
  }
}
