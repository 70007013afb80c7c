import { useState } from 'react';
import { EmptyState, Notice } from '../../../components/ui/notice';
import { useInbox, type CapturedMail } from '../api/get-inbox';
import { useShopFormat } from '../../../lib/format';

/** Mail captured by the local fake SMTP server. Plain text is shown: links stay clickable. */
function MailBody({ mail }: { mail: CapturedMail }) {
  const f = useShopFormat();
  const parts = mail.text.split(/(https?:\/\/\S+)/g);
  return (
    <article className="space-y-2">
      <h3 className="text-lg font-bold">{mail.subject}</h3>
      <p className="text-sm text-steel-600">
        To {mail.to.join(', ')} · {f.dateTime(mail.receivedAt)}
      </p>
      <pre className="whitespace-pre-wrap break-words rounded bg-steel-50 p-3 font-sans text-base">
        {parts.map((p, i) =>
          /^https?:\/\//.test(p) ? (
            <a key={i} className="font-semibold text-mandatory underline" href={p}>
              {p}
            </a>
          ) : (
            p
          ),
        )}
      </pre>
    </article>
  );
}

export function Inbox() {
  const f = useShopFormat();
  const q = useInbox();
  const [openId, setOpenId] = useState<number | null>(null);
  if (q.isError) return <Notice tone="danger">{q.error.message}</Notice>;
  if (q.isLoading) return <p role="status">Loading…</p>;
  const mails = q.data?.mails ?? [];
  if (!mails.length)
    return <EmptyState title="No mail captured yet">Invitations, password resets and work notices appear here within a few seconds.</EmptyState>;
  const open = mails.find((m) => m.id === openId) ?? mails[0];
  return (
    <div className="grid gap-4 md:grid-cols-[20rem_1fr]">
      <ul className="divide-y divide-steel-200 rounded border border-steel-200 bg-white" aria-label="Captured mail">
        {mails.map((m) => (
          <li key={m.id}>
            <button
              type="button"
              onClick={() => setOpenId(m.id)}
              className={`block w-full min-h-touch px-3 py-2 text-left ${m.id === open.id ? 'bg-steel-200' : 'hover:bg-steel-50'}`}
              aria-current={m.id === open.id || undefined}
            >
              <span className="block font-semibold">{m.subject}</span>
              <span className="block text-sm text-steel-600">
                {m.to.join(', ')} · {f.dateTime(m.receivedAt)}
              </span>
            </button>
          </li>
        ))}
      </ul>
      <div className="rounded border border-steel-200 bg-white p-4">
        <MailBody mail={open} />
      </div>
    </div>
  );
}
