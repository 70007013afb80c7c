import QRCode from 'qrcode';
import type { EntityManager } from '@mikro-orm/postgresql';
import { COLORS, cautionBox, newDoc, pdfText, stampPages, toBuffer } from './pdf';
import { EnergyProcedure, ProcedurePhoto, ProcedureVersion } from './procedure.entity';
import { SafetySignOff } from './sign-off.entity';
import { conflict, notFound } from '../../http/errors';
import { WORK_CAUTION } from '../../../shared/domain/cautions';
import { ENERGY_KIND_LABELS, PHASE_LABELS, PROCEDURE_PHASES } from '../../../shared/schemas/safety-procedures';

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
  if (!v) throw version ? notFound(`Version ${version}`) : conflict('This procedure has no approved version yet; approve a version before printing its placard');
  const signOff = v.approvalSignOff ? await em.findOne(SafetySignOff, v.approvalSignOff.id) : null;
  const photos = await em.find(ProcedurePhoto, { version: v.id }, { populate: ['data'], orderBy: { createdAt: 'asc' }, limit: 8 });
  const machine = proc.machine.getEntity();
  const c = v.content;
  const url = `${appUrl}/safety/procedures/${proc.id}`;
  const qr = await QRCode.toBuffer(url, { margin: 1, width: 180, errorCorrectionLevel: 'M' });

  const doc = newDoc({ Title: `Energy-control placard ${machine.code} v${v.version}`, Subject: c.title });
  const W = doc.page.width;
  const M = 36;
  const inner = W - 2 * M;

  // Red band: the instruction first, the machine code large on the right.
  doc.rect(0, 0, W, 92).fill(COLORS.danger);
  doc.fillColor('#ffffff').font('bold').fontSize(18).text('ISOLATE ALL ENERGY BEFORE YOU WORK HERE', M, 18, { width: inner - 126 });
  doc.font('regular').fontSize(10).text('Energy-control (lockout/tagout) procedure  ·  OSHA 29 CFR 1910.147  ·  only authorized employees apply locks', M, doc.y + 4, { width: inner - 126 });
  doc.rect(W - M - 112, 14, 112, 64).fill('#ffffff');
  doc.fillColor(COLORS.danger).font('bold').fontSize(machine.code.length > 5 ? 20 : 34).text(pdfText(machine.code), W - M - 112, machine.code.length > 5 ? 36 : 26, { width: 112, align: 'center' });

  // Identity strip.
  let y = 104;
  doc.fillColor(COLORS.steel900).font('bold').fontSize(15).text(pdfText(`${machine.name} — ${c.title}`), M, y, { width: inner - 100 });
  y = doc.y + 2;
  const approved = v.approvedAt ? `approved ${v.approvedAt.toISOString().slice(0, 10)} by ${v.approvedBy?.getEntity().name ?? '?'}` : 'NOT APPROVED';
  doc.font('regular').fontSize(9).fillColor(COLORS.steel700).text(pdfText(`Version ${v.version} (${v.status}), ${approved}${signOff ? `  ·  signature #${signOff.seq} ${signOff.hash.slice(0, 12)}` : ''}`), M, y, { width: inner - 100 });
  y = doc.y + 2;
  doc.text(pdfText(`Scope: ${c.scope}`), M, y, { width: inner - 100 });
  doc.image(qr, W - M - 84, 100, { width: 84 });
  doc.fontSize(6.5).text('Scan for the current version', W - M - 90, 186, { width: 96, align: 'center' });
  y = Math.max(doc.y, 198) + 8;

  const ensure = (h: number) => {
    if (y + h > doc.page.height - 60) {
      doc.addPage();
      y = M;
    }
  };

  // Energy sources.
  doc.rect(M, y, inner, 18).fill(COLORS.steel900);
  doc.fillColor('#ffffff').font('bold').fontSize(10).text(`ENERGY SOURCES (${c.sources.length})`, M + 8, y + 4);
  y += 24;
  for (const s of c.sources) {
    doc.font('regular').fontSize(8.5);
    const body = pdfText(`Isolate at: ${s.isolationDevice} — ${s.location}\nRelieve: ${s.relieveMethod}\nVerify: ${s.verifyMethod}`);
    const h = Math.max(44, doc.heightOfString(body, { width: inner - 200 }) + 22);
    ensure(h + 6);
    doc.rect(M, y, inner, h).lineWidth(0.8).stroke(COLORS.steel200);
    doc.circle(M + 22, y + 22, 16).fill(COLORS.caution);
    doc.fillColor(COLORS.steel900).font('bold').fontSize(s.key.length > 3 ? 8 : 11).text(pdfText(s.key), M + 6, y + (s.key.length > 3 ? 18 : 16), { width: 32, align: 'center' });
    doc.font('bold').fontSize(10).text(pdfText(ENERGY_KIND_LABELS[s.kind]), M + 46, y + 6, { width: 150 });
    doc.font('regular').fontSize(8.5).fillColor(COLORS.steel700).text(pdfText(`${s.description}\n${s.magnitude}`), M + 46, y + 20, { width: 150 });
    doc.fillColor(COLORS.steel900).text(body, M + 200, y + 6, { width: inner - 208 });
    y += h + 6;
  }

  // Steps in the order of 1910.147(d).
  y += 4;
  ensure(30);
  doc.rect(M, y, inner, 18).fill(COLORS.steel900);
  doc.fillColor('#ffffff').font('bold').fontSize(10).text('APPLY ENERGY CONTROL — IN THIS ORDER', M + 8, y + 4);
  y += 24;
  PROCEDURE_PHASES.forEach((phase, i) => {
    const steps = c.steps[phase];
    doc.font('regular').fontSize(9);
    const text = pdfText(steps.map((s, j) => `${i + 1}.${j + 1}  ${s}`).join('\n'));
    const h = doc.heightOfString(text, { width: inner - 160 }) + 10;
    ensure(h + 4);
    doc.fillColor(COLORS.steel900).font('bold').fontSize(10).text(`${i + 1}. ${PHASE_LABELS[phase].title}`, M, y, { width: 140 });
    doc.font('regular').fontSize(7.5).fillColor(COLORS.steel500).text(PHASE_LABELS[phase].source, M, doc.y, { width: 140 });
    doc.fillColor(COLORS.steel900).font('regular').fontSize(9).text(text, M + 150, y, { width: inner - 160 });
    y = Math.max(doc.y, y + 24) + 6;
    doc.moveTo(M, y - 3).lineTo(M + inner, y - 3).lineWidth(0.5).stroke(COLORS.steel200);
  });

  // Release (1910.147(e)).
  y += 4;
  doc.font('regular').fontSize(9);
  const rel = pdfText(c.release.map((s, j) => `${j + 1}.  ${s}`).join('\n'));
  const relH = doc.heightOfString(rel, { width: inner - 16 }) + 30;
  ensure(relH);
  doc.rect(M, y, inner, relH).fill('#e3f5e9');
  doc.rect(M, y, 6, relH).fill(COLORS.safe);
  doc.fillColor(COLORS.steel900).font('bold').fontSize(10).text('RELEASE — only the person whose lock it is removes it (1910.147(e))', M + 14, y + 6, { width: inner - 20 });
  doc.font('regular').fontSize(9).text(rel, M + 14, y + 20, { width: inner - 22 });
  y += relH + 8;

  // Photos of isolation points.
  if (photos.length) {
    const size = (inner - 30) / 4;
    ensure(size + 30);
    doc.fillColor(COLORS.steel900).font('bold').fontSize(10).text('ISOLATION POINTS', M, y);
    y += 14;
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
        doc.font('regular').fontSize(8).fillColor(COLORS.steel500).text('Photo in Kerfbook', x, y + size / 2 - 4, { width: size, align: 'center' });
      }
      doc.fillColor(COLORS.steel900).font('bold').fontSize(8).text(pdfText(`${p.sourceKey}${p.caption ? ` — ${p.caption}` : ''}`), x, y + size + 2, { width: size });
    });
    y += size + 20;
  }

  ensure(60);
  cautionBox(doc, WORK_CAUTION, M, y, inner);
  stampPages(doc, `Kerfbook placard · ${machine.code} · ${c.title} · version ${v.version} · printed ${new Date().toISOString().slice(0, 16).replace('T', ' ')} UTC · check the current version before use`);
  const pdf = await toBuffer(doc);
  return { pdf, fileName: `placard-${machine.code}-v${v.version}.pdf`.replace(/[^A-Za-z0-9._-]/g, '_') };
}
