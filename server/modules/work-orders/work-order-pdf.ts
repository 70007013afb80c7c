import PDFDocument from 'pdfkit';
import { createRequire } from 'node:module';
import { WORK_CAUTION } from '../../../shared/domain/cautions';
import { formatDateTime, type ShopClock } from '../../../shared/locale';
import { CHECK_RESULT_LABELS, WORK_STATE_LABELS, type WorkOrderDetail } from '../../../shared/schemas/work-orders';

const require = createRequire(import.meta.url);
// The product's typeface from the bundled font package: no network, no system fonts.
const REGULAR = require.resolve('@fontsource/roboto-condensed/files/roboto-condensed-latin-400-normal.woff');
const BOLD = require.resolve('@fontsource/roboto-condensed/files/roboto-condensed-latin-700-normal.woff');

/** The latin subset has no math signs; keep text inside it. */
const t = (s: string) =>
  s
    .replace(/≥/g, '>=')
    .replace(/≤/g, '<=')
    .replace(/…/g, '...')
    .replace(/[^\n\t\u0020-\u024F\u2010-\u2027\u2030-\u203A\u20AC°µ]/g, '?');

/** A printable work order sheet for the clipboard at the machine, caution first. */
export function workOrderPdf(wo: WorkOrderDetail, shop: ShopClock & { name: string }): Promise<Buffer> {
  const doc = new PDFDocument({ size: 'A4', margin: 40, info: { Title: `WO ${wo.number} ${wo.title}`, Creator: 'Kerfbook', Producer: 'Kerfbook' } });
  doc.registerFont('regular', REGULAR);
  doc.registerFont('bold', BOLD);
  const when = (iso: string | null) => formatDateTime(iso, shop);
  const width = doc.page.width - 80;

  doc
    .font('bold')
    .fontSize(18)
    .text(t(`WO ${wo.number} · ${wo.title}`));
  doc
    .font('regular')
    .fontSize(10)
    .fillColor('#485561')
    .text(t(`${shop.name} · ${wo.machine.code} ${wo.machine.name} · ${WORK_STATE_LABELS[wo.status]} · due ${when(wo.dueAt)}`));
  doc.moveDown(0.6);

  // Caution box (ISO 3864-1 caution yellow edge).
  const y = doc.y;
  doc.font('regular').fontSize(9).fillColor('#1e2730');
  const h = doc.heightOfString(t(`Safety: ${WORK_CAUTION}`), { width: width - 16 }) + 12;
  doc.rect(40, y, width, h).fill('#fff6d6');
  doc.rect(40, y, 5, h).fill('#f2b705');
  doc.fillColor('#1e2730').text(t(`Safety: ${WORK_CAUTION}`), 52, y + 6, { width: width - 16 });
  doc.y = y + h + 8;
  doc.x = 40;
  if (wo.requiresLockout) {
    doc
      .font('bold')
      .fontSize(11)
      .fillColor('#1d4ed8')
      .text('Lockout/tagout required: apply it under the site procedure before work starts, release it before sign-off.');
    doc.moveDown(0.4);
  }
  doc.fillColor('#1e2730');
  if (wo.instructions) {
    doc.font('bold').fontSize(12).text('Instructions');
    doc.font('regular').fontSize(10).text(t(wo.instructions), { width });
    doc.moveDown(0.6);
  }
  if (wo.checklist.length) {
    doc.font('bold').fontSize(12).text('Checklist');
    doc.font('regular').fontSize(10);
    for (const c of wo.checklist) {
      const limits = c.kind === 'measure' ? ` [${c.min ?? ''}…${c.max ?? ''} ${c.unit ?? ''}]` : '';
      const answer = c.result
        ? `${CHECK_RESULT_LABELS[c.result]}${c.value !== null ? ` (${c.value} ${c.unit ?? ''})` : ''}`
        : c.kind === 'measure'
          ? 'value: ________'
          : '';
      doc.text(t(`[${c.result ? 'x' : ' '}] ${c.label}${limits}   ${answer}`), { width });
    }
    doc.moveDown(0.6);
  }
  if (wo.plannedParts.length || wo.partsUsed.length) {
    doc.font('bold').fontSize(12).text('Parts');
    doc.font('regular').fontSize(10);
    for (const p of wo.plannedParts) doc.text(t(`Planned: ${p.quantity} ${p.stockUnit} ${p.partNumber} ${p.name}`));
    for (const p of wo.partsUsed) doc.text(t(`Used: ${p.quantity} ${p.stockUnit} ${p.partNumber} ${p.name}`));
    doc.moveDown(0.6);
  }
  doc.font('bold').fontSize(12).text('Sign-off');
  doc
    .font('regular')
    .fontSize(10)
    .text(
      t(
        `Time spent: ${wo.labourMinutes ? `${wo.labourMinutes} min` : '________ min'}    Signed off: ${wo.completedBy ? `${wo.completedBy.name}, ${when(wo.completedAt)}` : '____________________'}`,
      ),
    );
  if (wo.notes) doc.moveDown(0.3).text(t(`Notes: ${wo.notes}`), { width });
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = [];
    doc.on('data', (c: Buffer) => chunks.push(c));
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
    doc.end();
  });
}
