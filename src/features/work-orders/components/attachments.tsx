import { useRef, useState } from 'react';
import type { WorkOrderDetail } from '../../../../shared/schemas/work-orders';
import { ATTACHMENT_MAX_BYTES } from '../../../../shared/schemas/work-orders';
import { Button } from '../../../components/ui/button';
import { Notice } from '../../../components/ui/notice';
import { useUploadAttachment } from '../api/upload-attachment';
import { useShopFormat } from '../../../lib/format';

/** Photos (e.g. of a worn part) and PDFs (e.g. a lab report) kept with the work. */
export function Attachments({ wo, canUpload }: { wo: WorkOrderDetail; canUpload: boolean }) {
  const f = useShopFormat();
  const upload = useUploadAttachment();
  const input = useRef<HTMLInputElement>(null);
  const [message, setMessage] = useState<{ tone: 'danger' | 'safe'; text: string } | null>(null);
  const send = async () => {
    const file = input.current?.files?.[0];
    setMessage(null);
    if (!file) return setMessage({ tone: 'danger', text: 'Choose a photo or PDF first.' });
    if (file.size > ATTACHMENT_MAX_BYTES) return setMessage({ tone: 'danger', text: `The file is larger than ${ATTACHMENT_MAX_BYTES / 1024 / 1024} MB.` });
    try {
      await upload.mutateAsync({ id: wo.id, file });
      setMessage({ tone: 'safe', text: `${file.name} attached.` });
      if (input.current) input.current.value = '';
    } catch (err) {
      setMessage({ tone: 'danger', text: err instanceof Error ? err.message : 'Upload failed' });
    }
  };
  return (
    <div className="space-y-3">
      {wo.attachments.length === 0 ? <p className="text-steel-600">No photos or files yet.</p> : null}
      <ul className="grid gap-3 sm:grid-cols-2 lg:grid-cols-3">
        {wo.attachments.map((a) => {
          const href = `/api/work-orders/${wo.id}/attachments/${a.id}`;
          return (
            <li key={a.id} className="rounded border border-steel-200 bg-white p-2">
              {a.mimeType.startsWith('image/') ? <img src={href} alt={`Photo ${a.fileName}`} className="h-40 w-full rounded object-cover" /> : null}
              <a className="mt-1 inline-flex min-h-touch items-center font-semibold underline" href={href} target="_blank" rel="noreferrer">
                {a.fileName}
              </a>
              <p className="text-xs text-steel-600">
                {Math.ceil(a.size / 1024)} kB · {a.by} · {f.dateTime(a.at)}
              </p>
            </li>
          );
        })}
      </ul>
      {canUpload ? (
        <div className="flex flex-wrap items-end gap-3">
          {/* The browser's own file button is tiny; styled to the same glove-sized target as the rest. */}
          <div>
            <label htmlFor="wo-file" className="block text-sm font-semibold">
              Photo or PDF (up to {ATTACHMENT_MAX_BYTES / 1024 / 1024} MB)
            </label>
            <input
              id="wo-file"
              ref={input}
              type="file"
              accept="image/jpeg,image/png,image/webp,application/pdf"
              capture="environment"
              className="block min-h-touch w-full max-w-md text-base file:mr-3 file:min-h-touch file:cursor-pointer file:rounded file:border-2 file:border-steel-400 file:bg-white file:px-4 file:font-semibold file:text-steel-900"
            />
          </div>
          <Button variant="secondary" onClick={send} busy={upload.isPending}>
            Attach
          </Button>
        </div>
      ) : null}
      {message ? (
        <Notice tone={message.tone} role={message.tone === 'danger' ? 'alert' : 'status'}>
          {message.text}
        </Notice>
      ) : null}
    </div>
  );
}
