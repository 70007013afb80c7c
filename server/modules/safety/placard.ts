import { fedMachineNames } from './shared-points';
import QRCode from 'qrcode';
import type { EntityManager } from '@mikro-orm/postgresql';
import { COLORS, cautionBox, newDoc, pdfText, stampPages, toBuffer } from './pdf';
import { EnergyProcedure, ProcedurePhoto, ProcedureVersion } from './procedure.entity';
import { SafetySignOff } from './sign-off.entity';
import { Organization } from '../organizations/organization.entity';
import { conflict, notFound } from '../../http/errors';
import { WORK_CAUTION } from '../../../shared/domain/cautions';
import { ENERGY_KIND_LABELS, PHASE_LABELS, PROCEDURE_PHASES } from '../../../shared/schemas/safety-procedures';
import { clock } from '../../../shared/clock';
import { formatDate, formatDateTime, shopLocale } from '../../../shared/locale';

/**
 * The placard posted at the machine: our own layout. A red band says what to do before work,
 * the machine code is large enough to read from the aisle, each isolation point carries its
 * painted tag in a yellow disc, and the steps follow 1910.147(d) in order.
 */
export async function renderPlacard(em: EntityManager, procedureId: string, appUrl: string, version?: number): Promise<{ pdf: Buffer; fileName: string }> {
  const proc = await em.findOne(EnergyProcedure, procedureId, { populate: ['machine'] });
  if (!proc) throw notFound('Procedure');
  const v = version
    ? await em.findOne(ProcedureVersion, { procedure: proc.id, version }, { populate: ['approvedBy'] })
    : await em.findOne(ProcedureVersion, { procedure: proc.id, status: 'approved' }, { populate: ['approvedBy'], orderBy: { version: 'desc' } });
  if (!v)
    throw version ? notFound(`Version ${version}`) : conflict('This procedure has no approved version yet; approve a version before printing its placard');
  const signOff = v.approvalSignOff ? await em.findOne(SafetySignOff, v.approvalSignOff.id) : null;
  const photos = await em.find(ProcedurePhoto, { version: v.id }, { populate: ['data'], orderBy: { createdAt: 'asc' }, limit: 8 });
  const machine = proc.machine.getEntity();
  const c = v.content;
  const fed = await fedMachineNames(em, [c]);
  const url = `${appUrl}/safety/procedures/${proc.id}`;
  const qr = await QRCode.toBuffer(url, { margin: 1, width: 180, errorCorrectionLevel: 'M' });

  const tz = (await em.findOneOrFail(Organization, proc.organization.id)).timeZone;
  const shop = { timeZone: tz, locale: shopLocale() };
  // The procedure title usually names the machine already; the code is in the red box.
  const heading = c.title.toLowerCase().includes(machine.name.toLowerCase()) ? c.title : `${machine.name} — ${c.title}`;

  const doc = newDoc({ Title: `Energy-control placard ${machine.code} v${v.version}`, Subject: c.title });
  const W = doc.page.width;
  const M = 30;
  const inner = W - 2 * M;
  const bottomLimit = doc.page.height - 40;

  // Red band: the instruction first, the machine code large on the right.
  doc.rect(0, 0, W, 70).fill(COLORS.danger);
  doc
    .fillColor('#ffffff')
    .font('bold')
    .fontSize(17)
    .text('ISOLATE ALL ENERGY BEFORE YOU WORK HERE', M, 14, { width: inner - 120 });
  doc
    .font('regular')
    .fontSize(9)
    .text('Energy-control (lockout/tagout) procedure  ·  OSHA 29 CFR 1910.147  ·  only authorized employees apply locks', M, doc.y + 3, { width: inner - 120 });
  doc.rect(W - M - 104, 10, 104, 50).fill('#ffffff');
  doc
    .fillColor(COLORS.danger)
    .font('bold')
    .fontSize(machine.code.length > 5 ? 18 : 30)
    .text(pdfText(machine.code), W - M - 104, machine.code.length > 5 ? 26 : 19, { width: 104, align: 'center' });

  // Identity strip.
  let y = 78;
  doc
    .fillColor(COLORS.steel900)
    .font('bold')
    .fontSize(13)
    .text(pdfText(heading), M, y, { width: inner - 80 });
  y = doc.y + 1;
  const approved = v.approvedAt ? `approved ${formatDate(v.approvedAt, shop)} by ${v.approvedBy?.getEntity().name ?? '?'}` : 'NOT APPROVED';
  doc
    .font('regular')
    .fontSize(8)
    .fillColor(COLORS.steel700)
    .text(pdfText(`Version ${v.version} (${v.status}), ${approved}${signOff ? `  ·  signature #${signOff.seq} ${signOff.hash.slice(0, 12)}` : ''}`), M, y, {
      width: inner - 80,
    });
  y = doc.y + 1;
  doc.text(pdfText(`Scope: ${c.scope}`), M, y, { width: inner - 80 });
  doc.image(qr, W - M - 64, 76, { width: 64 });
  doc.fontSize(6).text('Scan for the current version', W - M - 72, 141, { width: 80, align: 'center' });
  y = Math.max(doc.y, 150) + 6;

  const ensure = (h: number) => {
    if (y + h > bottomLimit) {
      doc.addPage();
      y = M;
    }
  };

  // Energy sources.
  doc.rect(M, y, inner, 15).fill(COLORS.steel900);
  doc
    .fillColor('#ffffff')
    .font('bold')
    .fontSize(9)
    .text(`ENERGY SOURCES (${c.sources.length})`, M + 8, y + 3);
  y += 19;
  for (const s of c.sources) {
    doc.font('regular').fontSize(8);
    const feeds = s.feeds?.length ? `\nAlso feeds ${s.feeds.map((id) => fed[id]?.code ?? '?').join(', ')}: locking it locks them out too.` : '';
    const body = pdfText(`Isolate at: ${s.isolationDevice} — ${s.location}\nRelieve: ${s.relieveMethod}\nVerify: ${s.verifyMethod}${feeds}`);
    const left = pdfText(`${s.description}\n${s.magnitude}`);
    const h = Math.max(34, doc.heightOfString(body, { width: inner - 222 }) + 8, doc.heightOfString(left, { width: 150 }) + 20);
    ensure(h + 4);
    doc.rect(M, y, inner, h).lineWidth(0.8).stroke(COLORS.steel200);
    // The painted tag in a yellow pill, wide enough for "C2-E1".
    doc.roundedRect(M + 4, y + 6, 46, 20, 10).fill(COLORS.caution);
    doc
      .fillColor(COLORS.steel900)
      .font('bold')
      .fontSize(s.key.length > 5 ? 8 : 10)
      .text(pdfText(s.key), M + 4, y + (s.key.length > 5 ? 12 : 11), { width: 46, align: 'center' });
    doc
      .font('bold')
      .fontSize(9)
      .text(pdfText(ENERGY_KIND_LABELS[s.kind]), M + 56, y + 4, { width: 150 });
    doc
      .font('regular')
      .fontSize(8)
      .fillColor(COLORS.steel700)
      .text(left, M + 56, y + 16, { width: 150 });
    doc.fillColor(COLORS.steel900).text(body, M + 214, y + 4, { width: inner - 222 });
    y += h + 4;
  }

  // Steps in the order of 1910.147(d), with the release block beside them so the placard stays on one page.
  y += 4;
  const relW = 170;
  const stepsW = inner - relW - 10;
  const labelW = 132;
  doc.font('regular').fontSize(8);
  const stepTexts = PROCEDURE_PHASES.map((phase, i) => pdfText(c.steps[phase].map((s, j) => `${i + 1}.${j + 1}  ${s}`).join('\n')));
  // A phase row is as tall as its steps or its two-line label (title and clause), whichever is taller.
  const rowH = (i: number) => {
    doc.font('bold').fontSize(9);
    const label = doc.heightOfString(`${i + 1}. ${PHASE_LABELS[PROCEDURE_PHASES[i]].title}`, { width: labelW }) + 9;
    doc.font('regular').fontSize(8);
    return Math.max(doc.heightOfString(stepTexts[i], { width: stepsW - labelW - 6 }), label);
  };
  const stepsH = stepTexts.reduce((sum, _t, i) => sum + rowH(i) + 6, 0) + 19;
  const rel = pdfText(c.release.map((s, j) => `${j + 1}.  ${s}`).join('\n'));
  doc.font('regular').fontSize(8);
  const relH = doc.heightOfString(rel, { width: relW - 20 }) + 44;
  ensure(Math.min(Math.max(stepsH, relH), bottomLimit - M));
  const top = y;
  const topPage = doc.bufferedPageRange().count;
  doc.rect(M, y, stepsW, 15).fill(COLORS.steel900);
  doc
    .fillColor('#ffffff')
    .font('bold')
    .fontSize(9)
    .text('APPLY ENERGY CONTROL — IN THIS ORDER', M + 8, y + 3);
  y += 19;
  PROCEDURE_PHASES.forEach((phase, i) => {
    const h = rowH(i);
    ensure(h + 6);
    doc
      .fillColor(COLORS.steel900)
      .font('bold')
      .fontSize(9)
      .text(`${i + 1}. ${PHASE_LABELS[phase].title}`, M, y, { width: labelW });
    doc.font('regular').fontSize(6.5).fillColor(COLORS.steel500).text(PHASE_LABELS[phase].source, M, doc.y, { width: labelW });
    doc
      .fillColor(COLORS.steel900)
      .font('regular')
      .fontSize(8)
      .text(stepTexts[i], M + labelW + 6, y, { width: stepsW - labelW - 6 });
    y = Math.max(doc.y, y + h) + 6;
    doc
      .moveTo(M, y - 3)
      .lineTo(M + stepsW, y - 3)
      .lineWidth(0.5)
      .stroke(COLORS.steel200);
  });

  // Release (1910.147(e)), green: the way back to safe operation.
  const relX = M + stepsW + 10;
  // Beside the first step when the steps fit on this page; beside their continuation otherwise.
  const relY = doc.bufferedPageRange().count === topPage ? top : M;
  doc.rect(relX, relY, relW, relH).fill('#e3f5e9');
  doc.rect(relX, relY, 5, relH).fill(COLORS.safe);
  doc
    .fillColor(COLORS.steel900)
    .font('bold')
    .fontSize(9)
    .text('RELEASE — only the person whose lock it is removes it (1910.147(e))', relX + 12, relY + 6, { width: relW - 18 });
  doc
    .font('regular')
    .fontSize(8)
    .text(rel, relX + 12, doc.y + 4, { width: relW - 18 });
  y = Math.max(y, relY + relH) + 6;

  // Photos of isolation points.
  if (photos.length) {
    const size = (inner - 30) / 4;
    ensure(size + 30);
    doc.fillColor(COLORS.steel900).font('bold').fontSize(9).text('ISOLATION POINTS', M, y);
    y += 13;
    photos.forEach((p, i) => {
      if (i > 0 && i % 4 === 0) {
        y += size + 18;
        ensure(size + 18);
      }
      const x = M + (i % 4) * (size + 10);
      try {
        doc.image(p.data as Buffer, x, y, { fit: [size, size], align: 'center', valign: 'center' });
      } catch {
        // WebP cannot be embedded by pdfkit; name the photo instead of failing the placard.
        doc.rect(x, y, size, size).stroke(COLORS.steel200);
        doc
          .font('regular')
          .fontSize(8)
          .fillColor(COLORS.steel500)
          .text('Photo in Kerfbook', x, y + size / 2 - 4, { width: size, align: 'center' });
      }
      doc
        .fillColor(COLORS.steel900)
        .font('bold')
        .fontSize(8)
        .text(pdfText(`${p.sourceKey}${p.caption ? ` — ${p.caption}` : ''}`), x, y + size + 2, { width: size });
    });
    y += size + 20;
  }

  doc.font('regular').fontSize(8.5);
  ensure(doc.heightOfString(pdfText(WORK_CAUTION), { width: inner - 22 }) + 18);
  cautionBox(doc, WORK_CAUTION, M, y, inner);
  // Printed time in the site's own zone, named, so the placard matches the clocks in the shop.
  stampPages(
    doc,
    `Kerfbook placard · ${machine.code} · version ${v.version} · printed ${formatDateTime(clock.now(), shop)} (${tz}) · check the current version before use`,
  );
  const pdf = await toBuffer(doc);
  return { pdf, fileName: `placard-${machine.code}-v${v.version}.pdf`.replace(/[^A-Za-z0-9._-]/g, '_') };
}
