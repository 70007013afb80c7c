import { useState } from 'react';
import { Link } from 'react-router-dom';
import { Badge, Notice, Panel } from '../../../components/ui/notice';
import { Button } from '../../../components/ui/button';
import { SelectField, TextField } from '../../../components/ui/field';
import { WorkCaution } from '../../../components/ui/caution';
import { ApiError } from '../../../lib/api-client';
import { paths } from '../../../config/paths';
import { can, type Role } from '../../../../shared/permissions';
import { ENERGY_KIND_LABELS, PHASE_LABELS, PROCEDURE_PHASES, type ProcedureDetail, type VersionDetail } from '../../../../shared/schemas/safety-procedures';
import { useApproveVersion } from '../api/approve-version';
import { ProcedureChanges } from './procedure-changes';
import { ProcedureSideBySide } from './procedure-side-by-side';
import { FeedsLine, MissingSharedPoints } from './shared-points';
import { useUploadPhoto } from '../api/upload-photo';
import { useDeletePhoto } from '../api/delete-photo';
import { useSignFlow } from './sign-dialog';
import { useShopFormat } from '../../../lib/format';
import { PHOTO_TYPES, PROCEDURE_PHOTO_MAX_BYTES, megabytes } from '../../../../shared/schemas/photos';

const statusTone = { draft: 'caution', approved: 'safe', superseded: 'info' } as const;

/** The text of one version: energy sources with their photos, then the steps in 1910.147(d) order. */
export function VersionText({ procedureId, v, fedMachines = {} }: { procedureId: string; v: VersionDetail; fedMachines?: ProcedureDetail['fedMachines'] }) {
  const c = v.content;
  return (
    <div className="space-y-4">
      <p className="text-steel-800">{c.scope}</p>
      <section aria-labelledby={`src-${v.id}`} className="space-y-2">
        <h3 id={`src-${v.id}`} className="text-lg font-bold">
          Energy sources ({c.sources.length})
        </h3>
        <div className="grid gap-3 md:grid-cols-2">
          {c.sources.map((s) => (
            <article key={s.key} className="rounded border border-steel-300 bg-white p-3">
              <div className="flex items-start gap-3">
                <span className="flex h-12 min-w-12 shrink-0 items-center justify-center rounded-full bg-caution px-2 text-base font-bold text-steel-950">
                  {s.key}
                </span>
                <div>
                  <p className="font-bold">{ENERGY_KIND_LABELS[s.kind]}</p>
                  <p className="text-sm">
                    {s.description} · <strong>{s.magnitude}</strong>
                  </p>
                </div>
              </div>
              <dl className="mt-2 grid grid-cols-[7rem_1fr] gap-x-2 gap-y-1 text-sm">
                <dt className="font-semibold">Isolate at</dt>
                <dd>
                  {s.isolationDevice} — {s.location}
                </dd>
                <dt className="font-semibold">Relieve</dt>
                <dd>{s.relieveMethod}</dd>
                <dt className="font-semibold">Verify</dt>
                <dd>{s.verifyMethod}</dd>
              </dl>
              <FeedsLine feeds={s.feeds} machines={fedMachines} />
              <div className="mt-2 flex flex-wrap gap-2">
                {v.photos
                  .filter((p) => p.sourceKey === s.key)
                  .map((p) => (
                    <figure key={p.id} className="w-32">
                      <img
                        src={`/api/safety/procedures/${procedureId}/photos/${p.id}`}
                        alt={`Isolation point ${s.key}${p.caption ? `: ${p.caption}` : ''}`}
                        className="h-24 w-32 rounded border border-steel-300 object-cover"
                      />
                      {p.caption ? <figcaption className="text-xs">{p.caption}</figcaption> : null}
                    </figure>
                  ))}
              </div>
            </article>
          ))}
        </div>
      </section>
      <section aria-labelledby={`steps-${v.id}`}>
        <h3 id={`steps-${v.id}`} className="mb-2 text-lg font-bold">
          Apply energy control — in this order
        </h3>
        <ol className="space-y-3">
          {PROCEDURE_PHASES.map((phase, i) => (
            <li key={phase} className="grid gap-1 border-b border-steel-200 pb-2 md:grid-cols-[16rem_1fr]">
              <p className="font-semibold">
                {i + 1}. {PHASE_LABELS[phase].title}
                <span className="block text-xs font-normal text-steel-600">OSHA 29 CFR {PHASE_LABELS[phase].source}</span>
              </p>
              <ol className="list-decimal pl-5">
                {c.steps[phase].map((s, j) => (
                  <li key={j}>{s}</li>
                ))}
              </ol>
            </li>
          ))}
        </ol>
      </section>
      <section aria-labelledby={`rel-${v.id}`} className="rounded border-l-8 border-safe bg-safe-soft p-3">
        <h3 id={`rel-${v.id}`} className="font-bold text-safe-ink">
          Release — only the person whose lock it is removes it (1910.147(e))
        </h3>
        <ol className="list-decimal pl-5">
          {c.release.map((s, j) => (
            <li key={j}>{s}</li>
          ))}
        </ol>
      </section>
    </div>
  );
}

export function ProcedureView({ p, me, viewingVersion }: { p: ProcedureDetail; me: { name: string; role: Role }; viewingVersion?: number }) {
  const f = useShopFormat();
  const manage = can(me.role, 'safety.procedures.manage');
  // Technicians write and revise drafts; approving stays with the safety officer, never for their own draft.
  const drafts = can(me.role, 'safety.procedures.draft');
  const approve = useApproveVersion();
  const upload = useUploadPhoto();
  const del = useDeletePhoto();
  const { sign, dialog } = useSignFlow(me);
  const [retrain, setRetrain] = useState(true);
  const [message, setMessage] = useState<{ tone: 'safe' | 'danger'; text: string } | null>(null);
  const [photoKey, setPhotoKey] = useState('');
  const [caption, setCaption] = useState('');
  const [file, setFile] = useState<File | null>(null);
  const [photoError, setPhotoError] = useState<string | null>(null);
  const shown = p.current;
  const draft = p.draft;
  const inForce = shown?.status === 'approved' ? shown : null;
  const approveControls =
    draft && manage ? (
      <div className="space-y-3">
        <label className="flex min-h-touch items-center gap-3">
          <input type="checkbox" className="h-6 w-6" checked={retrain} onChange={(e) => setRetrain(e.target.checked)} />
          <span>This change needs retraining (untick only for an editorial fix, e.g. a typo or a photo)</span>
        </label>
        <Button
          onClick={() =>
            sign(
              'procedure-approved',
              async (password) => {
                await approve.mutateAsync({ id: p.id, version: draft.version, password, retrainingRequired: retrain });
                setMessage({
                  tone: 'safe',
                  text: `Version ${draft.version} approved and in force.${retrain && p.versions.some((v) => v.status === 'approved') ? ' Everyone trained on the old version is marked for retraining.' : ''}`,
                });
              },
              { onError: (err) => setMessage({ tone: 'danger', text: err instanceof ApiError ? err.message : 'Could not approve' }) },
            )
          }
        >
          Sign: approve version {draft.version}
        </Button>
      </div>
    ) : null;

  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-center gap-2">
        <span className="text-sm font-semibold">Versions:</span>
        {p.versions.map((v) => (
          <Link
            key={v.id}
            to={paths.safetyProcedure.getHref(p.id, v.version)}
            className="flex min-h-touch items-center gap-2 rounded border border-steel-300 bg-white px-3 text-sm"
            aria-current={shown?.version === v.version ? 'page' : undefined}
          >
            v{v.version} <Badge tone={statusTone[v.status]}>{v.status}</Badge>
          </Link>
        ))}
        {shown?.status === 'approved' ? (
          <a
            className="ml-auto flex min-h-touch items-center rounded bg-steel-800 px-4 font-semibold text-white"
            href={`/api/safety/procedures/${p.id}/placard.pdf?version=${shown.version}`}
            target="_blank"
            rel="noreferrer"
          >
            Print placard (PDF)
          </a>
        ) : null}
      </div>
      {message ? (
        <Notice tone={message.tone} role={message.tone === 'danger' ? 'alert' : 'status'}>
          {message.text}
        </Notice>
      ) : null}
      {viewingVersion && shown?.status === 'superseded' ? (
        <Notice tone="caution" title={`Version ${shown.version} is superseded`}>
          Kept for the record. Do not use it at the machine; follow the current approved version.
        </Notice>
      ) : null}

      {shown ? (
        <Panel
          title={`Version ${shown.version} — ${shown.content.title}`}
          actions={
            <span className="text-sm text-steel-700">
              {shown.approvedAt ? `Approved ${f.dateTime(shown.approvedAt)} by ${shown.approvedByName}` : `Draft by ${shown.authorName}`}
            </span>
          }
        >
          <WorkCaution />
          <div className="mt-4">
            <VersionText procedureId={p.id} v={shown} fedMachines={p.fedMachines} />
          </div>
        </Panel>
      ) : (
        <Notice tone="caution" title="Not approved yet">
          This procedure has no approved version. Nobody may lock out with it until the safety officer approves it.
        </Notice>
      )}

      {draft ? (
        <Panel
          title={`Draft version ${draft.version}`}
          actions={
            drafts ? (
              <Link className="font-semibold underline" to={paths.safetyProcedureEdit.getHref(p.id)}>
                Edit the draft
              </Link>
            ) : null
          }
        >
          <p className="mb-3 text-sm text-steel-700">
            Saved by {draft.authorName}, {f.dateTime(draft.createdAt)}. A draft is not in force until it is approved.
          </p>
          <div className="mb-3">
            <MissingSharedPoints
              points={p.feedingPoints}
              sources={draft.content.sources}
              machineCode={p.machine.code}
              editHref={drafts ? paths.safetyProcedureEdit.getHref(p.id) : undefined}
            />
          </div>
          {inForce ? (
            <>
              <ProcedureChanges current={inForce.content} currentVersion={inForce.version} draft={draft.content} />
              <ProcedureSideBySide current={inForce.content} currentVersion={inForce.version} draft={draft.content} draftVersion={draft.version}>
                {approveControls}
              </ProcedureSideBySide>
            </>
          ) : (
            <VersionText procedureId={p.id} v={draft} fedMachines={p.fedMachines} />
          )}
          {manage ? (
            <div className="space-y-4">
              <fieldset className="space-y-2 rounded border border-steel-300 p-3">
                <legend className="px-1 font-bold">Photos of isolation points</legend>
                {draft.photos.length ? (
                  <ul className="flex flex-wrap gap-2">
                    {draft.photos.map((ph) => (
                      <li key={ph.id} className="flex items-center gap-2 rounded border border-steel-200 p-1 text-sm">
                        <img
                          src={`/api/safety/procedures/${p.id}/photos/${ph.id}`}
                          alt={`Isolation point ${ph.sourceKey}`}
                          className="h-12 w-16 object-cover"
                        />
                        {ph.sourceKey}
                        <Button variant="ghost" onClick={() => del.mutate({ id: p.id, photoId: ph.id })}>
                          Remove
                        </Button>
                      </li>
                    ))}
                  </ul>
                ) : null}
                <div className="grid gap-3 md:grid-cols-[10rem_1fr_1fr_auto] md:items-end">
                  <SelectField
                    label="Isolation point"
                    value={photoKey}
                    onChange={(e) => setPhotoKey(e.target.value)}
                    options={[{ value: '', label: 'Choose' }, ...draft.content.sources.map((s) => ({ value: s.key, label: s.key }))]}
                  />
                  <div className="space-y-1">
                    <label htmlFor="photo-file" className="block text-sm font-semibold">
                      Photo (JPEG, PNG or WebP, up to {megabytes(PROCEDURE_PHOTO_MAX_BYTES)} MB)
                    </label>
                    <input
                      id="photo-file"
                      type="file"
                      accept={PHOTO_TYPES.join(',')}
                      className="block min-h-touch w-full text-sm"
                      onChange={(e) => setFile(e.target.files?.[0] ?? null)}
                    />
                  </div>
                  <TextField label="Caption (optional)" value={caption} onChange={(e) => setCaption(e.target.value)} />
                  <Button
                    variant="secondary"
                    disabled={!file || !photoKey}
                    busy={upload.isPending}
                    onClick={async () => {
                      setPhotoError(null);
                      try {
                        await upload.mutateAsync({ id: p.id, file: file!, sourceKey: photoKey, caption: caption || undefined });
                        setCaption('');
                      } catch (err) {
                        setPhotoError(err instanceof ApiError ? err.message : 'Upload failed');
                      }
                    }}
                  >
                    Upload
                  </Button>
                </div>
                {photoError ? (
                  <p role="alert" className="font-semibold text-danger">
                    {photoError}
                  </p>
                ) : null}
              </fieldset>
              {inForce ? null : approveControls}
            </div>
          ) : null}
        </Panel>
      ) : drafts && shown?.status === 'approved' ? (
        <Link
          className="inline-flex min-h-touch items-center rounded border border-steel-400 bg-white px-4 font-semibold"
          to={paths.safetyProcedureEdit.getHref(p.id)}
        >
          Change this procedure (starts draft version {Math.max(...p.versions.map((v) => v.version)) + 1})
        </Link>
      ) : null}
      {dialog}
    </div>
  );
}
