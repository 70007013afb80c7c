import { useState } from 'react';
import { Button } from '../../../components/ui/button';
import { Notice } from '../../../components/ui/notice';
import { useCheckChainCopy, useDownloadChainCopy } from '../api/chain-copies';

/** Saves the signed head as a small JSON file (a download the browser starts itself). */
function saveFile(name: string, text: string) {
  const url = URL.createObjectURL(new Blob([text], { type: 'application/json' }));
  const a = document.createElement('a');
  a.href = url;
  a.download = name;
  a.click();
  URL.revokeObjectURL(url);
}

/** The chain head outside the database: download a signed copy, or check one kept from a download or the daily mail. */
export function ChainCopies() {
  const download = useDownloadChainCopy();
  const check = useCheckChainCopy();
  const [text, setText] = useState('');
  const [parseError, setParseError] = useState<string | null>(null);

  const onDownload = () =>
    download.mutate(undefined, {
      onSuccess: (copy) => saveFile(`chain-head-${copy.seq}-${copy.madeAt.slice(0, 10)}.json`, JSON.stringify(copy, null, 2)),
    });
  const onCheck = () => {
    setParseError(null);
    let copy: unknown;
    try {
      copy = JSON.parse(text);
    } catch {
      setParseError('That is not the copy’s text: paste the whole block that starts with { and ends with }.');
      return;
    }
    check.mutate(copy);
  };

  return (
    <div className="mt-4 space-y-3 border-t border-steel-200 pt-4">
      <h3 className="font-semibold text-steel-900">Copies kept outside Kerfbook</h3>
      <p className="text-steel-700">
        Each day the safety officers get the newest record’s number and hash by mail, signed by this server. Verification compares the chain with the newest
        copy; a copy you kept can be checked here too, so history rewritten inside the database still shows.
      </p>
      <div className="flex flex-wrap gap-2">
        <Button variant="secondary" onClick={onDownload} busy={download.isPending}>
          Download the chain head
        </Button>
      </div>
      {download.isError ? (
        <Notice tone="danger" role="alert">
          {download.error.message}
        </Notice>
      ) : null}
      {download.data ? (
        <Notice tone="safe" role="status">
          Saved record #{download.data.seq}, hash {download.data.hash.slice(0, 16)}…. Keep the file somewhere other than this server.
        </Notice>
      ) : null}
      <label className="block text-sm font-semibold text-steel-800" htmlFor="kept-copy">
        Check a kept copy
      </label>
      <textarea
        id="kept-copy"
        className="block min-h-[6rem] w-full rounded border border-steel-400 bg-white px-3 py-2 font-mono text-sm"
        placeholder='{"format":"kerfbook-chain-head/1", …}'
        value={text}
        onChange={(e) => setText(e.target.value)}
      />
      <Button variant="secondary" onClick={onCheck} busy={check.isPending} disabled={!text.trim()}>
        Check the copy
      </Button>
      {parseError || check.isError ? (
        <Notice tone="danger" role="alert">
          {parseError ?? check.error?.message}
        </Notice>
      ) : null}
      {check.data && !parseError ? (
        <Notice tone={check.data.signatureValid && check.data.matches ? 'safe' : 'danger'} role={check.data.matches ? 'status' : 'alert'}>
          {check.data.message}
        </Notice>
      ) : null}
    </div>
  );
}
