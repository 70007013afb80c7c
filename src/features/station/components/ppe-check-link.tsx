import { Link, useLocation } from 'react-router-dom';
import { Notice } from '../../../components/ui/notice';
import { paths } from '../../../config/paths';

/** What the PPE check hands back to the station after signing (router state). */
export type PpeSignedState = { ppeSigned?: { machineCode: string; task: string; by: string; at: string } };

/** Opens the shift PPE check with this machine chosen; after signing it comes back here. */
export function PpeCheckLink({ machineId, code }: { machineId: string; code: string }) {
  return (
    <Link
      to={paths.safetyPpe.getHref(machineId, paths.station.getHref(code))}
      className="inline-flex min-h-touch items-center rounded border-2 border-mandatory bg-mandatory-soft px-4 font-semibold text-mandatory-ink"
    >
      PPE check at {code}
    </Link>
  );
}

/** The confirmation the PPE check leaves on the station it returned to. */
export function PpeSignedNotice({ code }: { code: string }) {
  const signed = (useLocation().state as PpeSignedState | null)?.ppeSigned;
  if (!signed || signed.machineCode !== code) return null;
  return (
    <Notice tone="safe" role="status" title="PPE check signed ✓">
      {signed.machineCode} · {signed.task}: signed by {signed.by} at {signed.at}. Work safely.
    </Notice>
  );
}
