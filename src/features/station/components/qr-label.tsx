import { useEffect, useState } from 'react';
import QRCode from 'qrcode';

/** A printable label: the QR code opens this machine's station page. */
export function QrLabel({ code, name, url }: { code: string; name: string; url: string }) {
  const [svg, setSvg] = useState<string | null>(null);
  const [error, setError] = useState<string | null>(null);
  useEffect(() => {
    QRCode.toString(url, { type: 'svg', errorCorrectionLevel: 'M', margin: 2 })
      .then(setSvg)
      .catch((e: unknown) => setError(e instanceof Error ? e.message : 'Could not draw the QR code'));
  }, [url]);
  return (
    <figure className="mx-auto w-[min(90vw,24rem)] space-y-3 rounded border-2 border-steel-900 bg-white p-6 text-center print:border-black">
      {svg ? (
        <div role="img" aria-label={`QR code that opens ${url}`} className="mx-auto w-full" dangerouslySetInnerHTML={{ __html: svg }} />
      ) : (
        <p role="status">{error ?? 'Drawing…'}</p>
      )}
      <figcaption className="space-y-1">
        <p className="text-4xl font-bold tracking-wide">{code}</p>
        <p className="text-lg">{name}</p>
        <p className="text-sm text-steel-700">Scan to log consumable changes and counters</p>
        <p className="break-all text-xs text-steel-600">{url}</p>
      </figcaption>
    </figure>
  );
}
