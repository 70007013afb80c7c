import type { EntityManager } from '@mikro-orm/postgresql';
import { ref } from '@mikro-orm/core';
import { fileTypeFromBuffer } from 'file-type';
import { Machine } from '../machines/machine.entity';
import { User } from '../users/user.entity';
import { EnergyProcedure, ProcedurePhoto, ProcedureVersion, type IProcedureVersion } from './procedure.entity';
import { PeriodicInspection } from './records.entity';
import { appendSignOff, sha256Hex } from './chain';
import { badRequest, conflict, fieldError, forbidden, notFound } from '../../http/errors';
import { recordActivity } from '../activity-log/activity-log.service';
import type { Principal } from '../../http/principal';
import { canonicalize } from '../../../shared/domain/signature-chain';
import {
  type CreateProcedureInput,
  type ProcedureContent,
  type ProcedureDetail,
  type ProcedureSummary,
  type VersionDetail,
  pointTag,
} from '../../../shared/schemas/safety-procedures';
import { inspectionEvaluation } from './due';
import { fedMachineNames, feedingPointsOf, refuseBadFeeds, requireFeedingPoints } from './shared-points';
import { loadSafetySettings } from './settings';
import { clock } from '../../../shared/clock';
import { PHOTO_TYPES, PROCEDURE_PHOTO_MAX_BYTES, megabytes } from '../../../shared/schemas/photos';

const iso = (d: Date | null | undefined) => (d ? d.toISOString() : null);

export async function listProcedures(em: EntityManager, who: Principal): Promise<ProcedureSummary[]> {
  const procedures = await em.find(EnergyProcedure, {}, { populate: ['machine'], orderBy: { machine: { code: 'asc' }, title: 'asc' } });
  if (procedures.length === 0) return [];
  const versions = await em.find(ProcedureVersion, { procedure: { $in: procedures.map((p) => p.id) } }, { orderBy: { version: 'asc' } });
  const inspections = await em.find(
    PeriodicInspection,
    { procedure: { $in: procedures.map((p) => p.id) }, certifiedAt: { $ne: null } },
    { orderBy: { inspectedOn: 'asc' } },
  );
  const { settings, timeZone } = await loadSafetySettings(em, who.orgId);
  const now = clock.now();
  return procedures.map((proc) => {
    const mine = versions.filter((v) => v.procedure.id === proc.id);
    const current = mine.filter((v) => v.status === 'approved').at(-1) ?? null;
    const draft = mine.find((v) => v.status === 'draft') ?? null;
    const firstApproved = mine.find((v) => v.approvedAt)?.approvedAt ?? null;
    const lastInspection = inspections.filter((i) => i.procedure.id === proc.id).at(-1) ?? null;
    const due = firstApproved
      ? inspectionEvaluation({
          firstApprovedAt: firstApproved,
          lastInspectedOn: lastInspection?.inspectedOn ?? null,
          months: settings.inspectionIntervalMonths,
          timeZone,
          now,
        })
      : null;
    const machine = proc.machine.getEntity();
    return {
      id: proc.id,
      machineId: machine.id,
      machineCode: machine.code,
      machineName: machine.name,
      title: proc.title,
      currentVersion: current?.version ?? null,
      currentApprovedAt: iso(current?.approvedAt),
      draftVersion: draft?.version ?? null,
      lastInspectionAt: lastInspection?.inspectedOn ?? null,
      inspectionDueAt: iso(due?.dueAt),
    };
  });
}

async function versionDetail(em: EntityManager, v: IProcedureVersion): Promise<VersionDetail> {
  await em.populate(v, ['author', 'approvedBy']);
  const photos = await em.find(ProcedurePhoto, { version: v.id }, { orderBy: { createdAt: 'asc' } });
  return {
    id: v.id,
    version: v.version,
    status: v.status,
    content: v.content,
    authorName: v.author.getEntity().name,
    createdAt: v.createdAt.toISOString(),
    approvedAt: iso(v.approvedAt),
    approvedByName: v.approvedBy?.getEntity().name ?? null,
    approvalSignOffId: v.approvalSignOff?.id ?? null,
    retrainingRequired: v.retrainingRequired,
    photos: photos.map((p) => ({ id: p.id, sourceKey: p.sourceKey, caption: p.caption ?? null, mime: p.mime, size: p.size })),
  };
}

export async function getProcedure(em: EntityManager, who: Principal, id: string, version?: number): Promise<ProcedureDetail> {
  const proc = await em.findOne(EnergyProcedure, id, { populate: ['machine'] });
  if (!proc) throw notFound('Procedure');
  const versions = await em.find(ProcedureVersion, { procedure: proc.id }, { orderBy: { version: 'asc' }, populate: ['approvedBy'] });
  const current = version !== undefined ? versions.find((v) => v.version === version) : versions.filter((v) => v.status === 'approved').at(-1);
  if (version !== undefined && !current) throw notFound(`Version ${version}`);
  const draft = versions.find((v) => v.status === 'draft');
  const machine = proc.machine.getEntity();
  const shown = [current, draft].filter((v) => !!v);
  return {
    id: proc.id,
    machine: { id: machine.id, code: machine.code, name: machine.name, kind: machine.kind },
    fedMachines: await fedMachineNames(
      em,
      shown.map((v) => v.content),
    ),
    feedingPoints: (await feedingPointsOf(em, who.orgId, [machine.id])).get(machine.id) ?? [],
    versions: versions.map((v) => ({
      id: v.id,
      version: v.version,
      status: v.status,
      approvedAt: iso(v.approvedAt),
      approvedByName: v.approvedBy?.getEntity().name ?? null,
    })),
    current: current ? await versionDetail(em, current) : null,
    draft: draft && draft !== current ? await versionDetail(em, draft) : null,
  };
}

export async function createProcedure(em: EntityManager, who: Principal, input: CreateProcedureInput): Promise<{ id: string; versionId: string }> {
  const { machineId, ...content } = input;
  return em.transactional(async (tx) => {
    const machine = await tx.findOne(Machine, machineId);
    if (!machine) throw notFound('Machine');
    await refuseMachineCodeTags(tx, machine, content);
    await refuseBadFeeds(tx, machine, content);
    const proc = tx.create(EnergyProcedure, { organization: who.orgId, machine, title: content.title });
    const v = tx.create(ProcedureVersion, {
      organization: who.orgId,
      procedure: proc,
      version: 1,
      status: 'draft',
      content,
      author: who.userId,
      retrainingRequired: true,
    });
    recordActivity(tx, who, 'safety.procedure-created', { type: 'EnergyProcedure', id: proc.id }, { machine: machine.code, title: content.title });
    return { id: proc.id, versionId: v.id };
  });
}

/** A point tag equal to a machine code ("H1") would be read as that machine on the placard and the lock. */
async function refuseMachineCodeTags(em: EntityManager, machine: { code: string }, content: ProcedureContent) {
  const codes = new Set((await em.find(Machine, {}, { fields: ['code'] })).map((m) => m.code.toUpperCase()));
  content.sources.forEach((s, i) => {
    if (codes.has(s.key.toUpperCase()))
      throw fieldError(`sources.${i}.key`, `${s.key} is also a machine code; use a tag such as ${pointTag(machine.code, i + 1)}`);
  });
}

/** Edits the open draft, or starts a new draft version from the text sent. Approved versions never change. */
export async function saveDraft(
  em: EntityManager,
  who: Principal,
  procedureId: string,
  content: ProcedureContent,
): Promise<{ versionId: string; version: number }> {
  return em.transactional(async (tx) => {
    const proc = await tx.findOne(EnergyProcedure, procedureId, { populate: ['machine'] });
    if (!proc) throw notFound('Procedure');
    await refuseMachineCodeTags(tx, proc.machine.getEntity(), content);
    await refuseBadFeeds(tx, proc.machine.getEntity(), content);
    // Serialise draft creation per procedure so two editors cannot both open version N+1.
    await tx.execute('select id from safety_procedure where id = ? for update', [proc.id]);
    const versions = await tx.find(ProcedureVersion, { procedure: proc.id }, { orderBy: { version: 'asc' } });
    let draft = versions.find((v) => v.status === 'draft');
    if (draft) {
      draft.content = content;
      draft.author = tx.getReference(User, who.userId, { wrapped: true });
    } else {
      const latest = versions.at(-1)!;
      draft = tx.create(ProcedureVersion, {
        organization: who.orgId,
        procedure: proc,
        version: latest.version + 1,
        status: 'draft',
        content,
        author: who.userId,
        retrainingRequired: true,
      });
      // Photos carry over to the new draft; the approved version keeps its own.
      const photos = await tx.find(ProcedurePhoto, { version: latest.id }, { populate: ['data'] });
      for (const p of photos)
        tx.create(ProcedurePhoto, {
          organization: who.orgId,
          version: draft,
          sourceKey: p.sourceKey,
          caption: p.caption,
          mime: p.mime,
          size: p.size,
          data: p.data,
        });
    }
    recordActivity(tx, who, 'safety.procedure-draft-saved', { type: 'ProcedureVersion', id: draft.id }, { version: draft.version });
    return { versionId: draft.id, version: draft.version };
  });
}

/** Digest of the procedure text that the approval signature covers. */
export const contentDigest = (content: ProcedureContent) => sha256Hex(canonicalize(content));

export async function approveVersion(em: EntityManager, who: Principal, procedureId: string, version: number, retrainingRequired: boolean) {
  return em.transactional(async (tx) => {
    const proc = await tx.findOne(EnergyProcedure, procedureId, { populate: ['machine'] });
    if (!proc) throw notFound('Procedure');
    await tx.execute('select id from safety_procedure where id = ? for update', [proc.id]);
    const versions = await tx.find(ProcedureVersion, { procedure: proc.id }, { orderBy: { version: 'asc' } });
    const v = versions.find((x) => x.version === version);
    if (!v) throw notFound(`Version ${version}`);
    if (v.status !== 'draft') throw conflict(`Version ${version} is ${v.status}; only a draft can be approved`);
    // Review by a second person: the author of a procedure does not approve it (common practice for controlled documents).
    if (v.author.id === who.userId)
      throw forbidden(`You wrote version ${version} of this procedure, so someone else must review and approve it; nothing was signed`);
    await requireFeedingPoints(tx, who.orgId, proc.machine.getEntity(), v.content.sources);
    const previous = versions.filter((x) => x.status === 'approved');
    const photos = await tx.count(ProcedurePhoto, { version: v.id });
    const signOff = await appendSignOff(tx, who, {
      meaning: 'procedure-approved',
      subjectType: 'procedure-version',
      subjectId: v.id,
      machineId: proc.machine.id,
      details: {
        summary: `${v.content.title} — version ${v.version}${previous.length ? `, replaces version ${previous.at(-1)!.version}` : ''}${retrainingRequired ? '' : ' (no retraining)'}`,
        procedureId: proc.id,
        version: v.version,
        contentSha256: contentDigest(v.content),
        energySources: v.content.sources.map((s) => s.key),
        photos,
        retrainingRequired,
      },
    });
    for (const old of previous) old.status = 'superseded';
    v.status = 'approved';
    v.approvedAt = signOff.signedAt;
    v.approvedBy = tx.getReference(User, who.userId, { wrapped: true });
    v.approvalSignOff = ref(signOff);
    // The first version always counts as a change people must be trained on.
    v.retrainingRequired = previous.length === 0 ? true : retrainingRequired;
    proc.title = v.content.title;
    recordActivity(tx, who, 'safety.procedure-approved', { type: 'ProcedureVersion', id: v.id }, { version: v.version, signOffId: signOff.id });
    return { versionId: v.id, version: v.version, signOffId: signOff.id };
  });
}

export async function addPhoto(
  em: EntityManager,
  who: Principal,
  procedureId: string,
  file: { buffer: Buffer; size: number } | undefined,
  fields: { sourceKey: string; caption?: string },
) {
  if (!file) throw fieldError('photo', 'Choose a photo to upload');
  if (file.size > PROCEDURE_PHOTO_MAX_BYTES) throw fieldError('photo', `The photo is larger than ${megabytes(PROCEDURE_PHOTO_MAX_BYTES)} MB`);
  // Trust the bytes, not the file name or the browser's content type.
  const type = await fileTypeFromBuffer(file.buffer);
  if (!type || !(PHOTO_TYPES as readonly string[]).includes(type.mime)) {
    throw fieldError('photo', `Only JPEG, PNG or WebP photos are accepted${type ? ` (this file is ${type.mime})` : ' (this file is not an image)'}`);
  }
  return em.transactional(async (tx) => {
    const proc = await tx.findOne(EnergyProcedure, procedureId);
    if (!proc) throw notFound('Procedure');
    const draft = await tx.findOne(ProcedureVersion, { procedure: proc.id, status: 'draft' });
    if (!draft) throw conflict('Photos are added to a draft: save a draft version first; approved versions do not change');
    if (!draft.content.sources.some((s) => s.key === fields.sourceKey)) throw fieldError('sourceKey', `The draft has no isolation point ${fields.sourceKey}`);
    const count = await tx.count(ProcedurePhoto, { version: draft.id });
    if (count >= 20) throw badRequest('A version holds at most 20 photos');
    const photo = tx.create(ProcedurePhoto, {
      organization: who.orgId,
      version: draft,
      sourceKey: fields.sourceKey,
      caption: fields.caption ?? null,
      mime: type.mime,
      size: file.size,
      data: file.buffer,
    });
    recordActivity(
      tx,
      who,
      'safety.procedure-photo-added',
      { type: 'ProcedurePhoto', id: photo.id },
      { version: draft.version, sourceKey: fields.sourceKey, size: file.size },
    );
    return { id: photo.id, versionId: draft.id };
  });
}

export async function getPhoto(em: EntityManager, procedureId: string, photoId: string) {
  const photo = await em.findOne(ProcedurePhoto, { id: photoId, version: { procedure: procedureId } }, { populate: ['data'] });
  if (!photo) throw notFound('Photo');
  return photo;
}

export async function deletePhoto(em: EntityManager, who: Principal, procedureId: string, photoId: string) {
  await em.transactional(async (tx) => {
    const photo = await tx.findOne(ProcedurePhoto, { id: photoId, version: { procedure: procedureId } }, { populate: ['version'] });
    if (!photo) throw notFound('Photo');
    if (photo.version.getEntity().status !== 'draft') throw conflict('This photo belongs to an approved version, which does not change');
    recordActivity(tx, who, 'safety.procedure-photo-removed', { type: 'ProcedurePhoto', id: photo.id });
    tx.remove(photo);
  });
}
