import { useRef, useState, type FormEvent } from 'react';
import { Button } from '../../../components/ui/button';
import { TextField } from '../../../components/ui/field';
import { Notice } from '../../../components/ui/notice';
import { ConfirmDialog } from '../../../components/ui/confirm-dialog';
import { machinePhotoUrl, useDeleteMachinePhoto, useMachinePhotos, useUploadMachinePhoto } from '../api/machine-photos';
import type { MachinePhotoRow } from '../../../../shared/schemas/machines';
import { PHOTO_MAX_BYTES, PHOTO_TYPES, megabytes } from '../../../../shared/schemas/photos';

const altOf = (code: string, p: MachinePhotoRow, i: number) => (p.caption ? `${code}: ${p.caption}` : `${code}, photo ${i + 1} (no caption)`);

/** Thumbnails of a machine's photos; admins and technicians can add and delete (with confirmation). */
export function MachinePhotos({ machineId, code, canManage }: { machineId: string; code: string; canManage: boolean }) {
  const photos = useMachinePhotos(machineId);
  const upload = useUploadMachinePhoto(machineId);
  const remove = useDeleteMachinePhoto(machineId);
  const [toDelete, setToDelete] = useState<MachinePhotoRow | null>(null);
  const [caption, setCaption] = useState('');
  const fileRef = useRef<HTMLInputElement>(null);

  const submit = (e: FormEvent) => {
    e.preventDefault();
    const file = fileRef.current?.files?.[0];
    if (!file) return;
    upload.mutate(
      { file, caption: caption.trim() || undefined },
      {
        onSuccess: () => {
          setCaption('');
          if (fileRef.current) fileRef.current.value = '';
        },
      },
    );
  };

  if (photos.isError)
    return (
      <Notice tone="danger" role="alert">
        {photos.error.message}
      </Notice>
    );
  const rows = photos.data ?? [];
  return (
    <div className="space-y-4">
      {photos.isPending ? (
        <p role="status">Loading photos…</p>
      ) : rows.length === 0 ? (
        <p>No photos yet.</p>
      ) : (
        <ul className="flex flex-wrap gap-3" aria-label={`Photos of ${code}`}>
          {rows.map((p, i) => (
            <li key={p.id} className="w-40 space-y-1">
              <a href={machinePhotoUrl(machineId, p.id)} target="_blank" rel="noreferrer" className="block min-h-touch">
                <img
                  src={machinePhotoUrl(machineId, p.id)}
                  alt={altOf(code, p, i)}
                  loading="lazy"
                  className="h-32 w-40 rounded border border-steel-300 object-cover"
                />
              </a>
              {p.caption ? <p className="text-sm">{p.caption}</p> : null}
              {canManage ? (
                <Button variant="secondary" onClick={() => setToDelete(p)} aria-label={`Delete ${altOf(code, p, i)}`}>
                  Delete
                </Button>
              ) : null}
            </li>
          ))}
        </ul>
      )}
      {canManage ? (
        <form onSubmit={submit} className="space-y-3" aria-label={`Add a photo of ${code}`}>
          <div>
            <label htmlFor={`photo-${machineId}`} className="block font-semibold">
              Photo (JPEG, PNG or WebP, at most {megabytes(PHOTO_MAX_BYTES)} MB)
            </label>
            <input id={`photo-${machineId}`} ref={fileRef} type="file" accept={PHOTO_TYPES.join(',')} required className="min-h-touch" />
          </div>
          <TextField
            label="Caption (optional, used as the description for screen readers)"
            value={caption}
            maxLength={200}
            onChange={(e) => setCaption(e.target.value)}
          />
          {upload.isError ? (
            <Notice tone="danger" role="alert">
              {upload.error.message}
            </Notice>
          ) : null}
          <Button type="submit" busy={upload.isPending}>
            Upload photo
          </Button>
        </form>
      ) : null}
      <ConfirmDialog
        open={!!toDelete}
        title="Delete this photo?"
        confirmLabel="Delete photo"
        tone="danger"
        busy={remove.isPending}
        onCancel={() => setToDelete(null)}
        onConfirm={() => toDelete && remove.mutate(toDelete.id, { onSuccess: () => setToDelete(null) })}
      >
        {toDelete?.caption ? `“${toDelete.caption}” will be removed from ${code}.` : `The photo will be removed from ${code}.`} This cannot be undone.
      </ConfirmDialog>
      {remove.isError ? (
        <Notice tone="danger" role="alert">
          {remove.error.message}
        </Notice>
      ) : null}
    </div>
  );
}
