import { WORK_CAUTION } from '../../shared/domain/cautions';

const escape = (s: string) => s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c] as string);

/** A paragraph that is a link of its own: a listed work order that opens its page. */
export type MailLine = { text: string; url: string };
type Layout = { heading: string; paragraphs: (string | MailLine)[]; action?: { label: string; url: string }; caution?: boolean };

const paragraphText = (p: string | MailLine) => (typeof p === 'string' ? p : `${p.text}\n${p.url}`);
const paragraphHtml = (p: string | MailLine) =>
  typeof p === 'string' ? `<p>${escape(p)}</p>` : `<p><a href="${escape(p.url)}" style="color:#1f2933">${escape(p.text)}</a></p>`;

/** One plain layout for every mail: a heading, paragraphs (some of them links), one action link, an optional caution. */
export function renderMail({ heading, paragraphs, action, caution }: Layout): { text: string; html: string } {
  const text = [
    heading,
    '',
    ...paragraphs.flatMap((p) => [paragraphText(p), '']),
    ...(action ? [`${action.label}: ${action.url}`, ''] : []),
    ...(caution ? [`Safety: ${WORK_CAUTION}`, ''] : []),
    '— Kerfbook',
  ].join('\n');
  const html = `<!doctype html><html><body style="font-family:sans-serif;color:#1f2933;max-width:560px">
<h2 style="margin:0 0 12px">${escape(heading)}</h2>
${paragraphs.map(paragraphHtml).join('\n')}
${action ? `<p><a href="${escape(action.url)}" style="display:inline-block;background:#334155;color:#fff;padding:10px 16px;text-decoration:none">${escape(action.label)}</a></p>` : ''}
${caution ? `<p style="border-left:4px solid #d97706;padding:8px 12px;background:#fff7e6"><strong>Safety:</strong> ${escape(WORK_CAUTION)}</p>` : ''}
<p style="color:#64748b;font-size:12px">Kerfbook</p>
</body></html>`;
  return { text, html };
}
