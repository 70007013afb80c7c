// Reads PDFs in-process (pdf.js through pdf-parse), so no system tool is needed to test them.
import { PDFParse } from 'pdf-parse';

export type PdfContents = { text: string; pages: number; firstPagePng: Buffer };

/** The text of every page (pages joined by a newline), the page count and page 1 as a PNG. */
export async function readPdf(data: Buffer | Uint8Array, opts: { scale?: number } = {}): Promise<PdfContents> {
  const parser = new PDFParse({ data: new Uint8Array(data) });
  try {
    const text = await parser.getText({ pageJoiner: '' });
    const shot = await parser.getScreenshot({ scale: opts.scale ?? 0.8, first: 1 });
    return { text: text.text, pages: text.total, firstPagePng: Buffer.from(shot.pages[0].data) };
  } finally {
    await parser.destroy();
  }
}
