import { useState } from 'react';
import { createColumnHelper } from '@tanstack/react-table';
import { Button } from '../../../components/ui/button';
import { DataTable } from '../../../components/ui/data-table';
import { Badge, Notice } from '../../../components/ui/notice';
import type { ImportPreview, ImportResult } from '../../../../shared/schemas/counter-import';
import type { RowError } from '../../../../shared/domain/counter-import';
import { COUNTER_IMPORT_MAX_BYTES } from '../../../../shared/schemas/counter-import';
import { useImportCounterCsv, usePreviewCounterCsv, type UploadProgress } from '../api/upload-counter-csv';
import { ShopTime } from '../../../lib/format';

const errCol = createColumnHelper<RowError>();
const errorColumns = [
  errCol.accessor('line', { header: 'Line' }),
  errCol.accessor('column', { header: 'Column', cell: (c) => c.getValue() ?? 'whole row' }),
  errCol.accessor('message', { header: 'Problem', enableSorting: false }),
];
type Sample = ImportPreview['sample'][number];
const sampleCol = createColumnHelper<Sample>();
const STATUS = {
  add: { tone: 'safe', label: 'Will be added' },
  duplicate: { tone: 'info', label: 'Already recorded' },
  error: { tone: 'danger', label: 'Problem' },
} as const;
// While the file has problems nothing is added, so a good row only says it is fine.
const statusOf = (s: Sample['status'], blocked: boolean) => (s === 'add' && blocked ? { tone: 'info' as const, label: 'Row is fine' } : STATUS[s]);
const sampleColumns = (blocked: boolean) => [
  sampleCol.accessor('line', { header: 'Line' }),
  sampleCol.accessor('machineCode', { header: 'Machine' }),
  sampleCol.accessor('meterCode', { header: 'Meter' }),
  sampleCol.accessor('readAt', { header: 'Read at', cell: (c) => <ShopTime at={c.getValue()} /> }),
  sampleCol.accessor('value', { header: 'Value' }),
  sampleCol.accessor('reset', { header: 'Reset', cell: (c) => (c.getValue() ? 'yes' : 'no') }),
  sampleCol.accessor('status', {
    header: 'Status',
    cell: (c) => <Badge tone={statusOf(c.getValue(), blocked).tone}>{statusOf(c.getValue(), blocked).label}</Badge>,
  }),
];
const PHASE = { uploading: 'Uploading', reading: 'Reading rows', checking: 'Checking against stored readings', writing: 'Writing readings' } as const;

function ProgressBar({ p }: { p: UploadProgress }) {
  const pct = p.total > 0 ? Math.round((100 * p.done) / p.total) : 0;
  return (
    <div role="status" aria-live="polite" className="space-y-1">
      <p className="text-sm font-semibold">
        {PHASE[p.phase]}: {pct} %
      </p>
      <progress className="h-4 w-full" max={100} value={pct} aria-label={`${PHASE[p.phase]} progress`} />
    </div>
  );
}

/** Upload → preview (nothing written) → import, all or nothing. */
export function CounterImport() {
  const [file, setFile] = useState<File | null>(null);
  const [progress, setProgress] = useState<UploadProgress | null>(null);
  const [preview, setPreview] = useState<ImportPreview | null>(null);
  const [result, setResult] = useState<ImportResult | null>(null);
  const [error, setError] = useState<string | null>(null);
  const previewM = usePreviewCounterCsv();
  const importM = useImportCounterCsv();
  const busy = previewM.isPending || importM.isPending;

  const choose = (f: File | null) => {
    setFile(f);
    setPreview(null);
    setResult(null);
    setError(null);
    if (f && f.size > COUNTER_IMPORT_MAX_BYTES)
      setError(`${f.name} is ${(f.size / 1024 / 1024).toFixed(1)} MB; the limit is 50 MB. Split it into smaller files.`);
  };
  const runPreview = async () => {
    if (!file) return;
    setError(null);
    setResult(null);
    try {
      setPreview(await previewM.mutateAsync({ file, onProgress: setProgress }));
    } catch (err) {
      setError(err instanceof Error ? err.message : 'The preview failed');
    } finally {
      setProgress(null);
    }
  };
  const runImport = async () => {
    if (!file) return;
    setError(null);
    try {
      setResult(await importM.mutateAsync({ file, onProgress: setProgress }));
      setPreview(null);
    } catch (err) {
      setError(err instanceof Error ? err.message : 'The import failed');
    } finally {
      setProgress(null);
    }
  };

  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-end gap-3">
        <label className="flex flex-col gap-1 text-sm font-semibold">
          CSV file (at most 50 MB)
          <input
            type="file"
            accept=".csv,text/csv"
            className="min-h-touch rounded border border-steel-400 bg-white p-2 font-normal"
            onChange={(e) => choose(e.target.files?.[0] ?? null)}
            disabled={busy}
          />
        </label>
        <Button onClick={runPreview} disabled={!file || busy || (file?.size ?? 0) > COUNTER_IMPORT_MAX_BYTES} busy={previewM.isPending}>
          Check the file
        </Button>
      </div>
      {progress ? <ProgressBar p={progress} /> : null}
      {error ? (
        <Notice tone="danger" role="alert" title="Not imported">
          {error}
        </Notice>
      ) : null}
      {result ? (
        <Notice tone="safe" role="status" title="Imported">
          {result.added} reading{result.added === 1 ? '' : 's'} added from {result.rows} row{result.rows === 1 ? '' : 's'}
          {result.duplicates ? `; ${result.duplicates} already recorded, skipped` : ''}.
        </Notice>
      ) : null}
      {preview ? (
        <section aria-label="Preview" className="space-y-4">
          {preview.errorCount > 0 ? (
            <Notice
              tone="danger"
              role="alert"
              title={`${preview.errorCount} problem${preview.errorCount === 1 ? '' : 's'} found — nothing can be imported yet`}
            >
              The whole file is imported or none of it. Fix the rows listed below and check the file again. Nothing has been written.
            </Notice>
          ) : (
            <Notice tone="safe" role="status" title="The file is fine">
              {preview.toAdd} reading{preview.toAdd === 1 ? '' : 's'} to add{preview.duplicates ? `, ${preview.duplicates} already recorded (skipped)` : ''}.
              Nothing has been written yet.
            </Notice>
          )}
          <dl className="grid grid-cols-2 gap-3 text-sm md:grid-cols-4">
            <div className="rounded border border-steel-200 bg-steel-50 p-3">
              <dt className="text-steel-600">Rows</dt>
              <dd className="text-2xl font-bold tabular-nums">{preview.rows}</dd>
            </div>
            <div className="rounded border border-steel-200 bg-steel-50 p-3">
              <dt className="text-steel-600">To add</dt>
              <dd className="text-2xl font-bold tabular-nums">{preview.toAdd}</dd>
            </div>
            <div className="rounded border border-steel-200 bg-steel-50 p-3">
              <dt className="text-steel-600">Already recorded</dt>
              <dd className="text-2xl font-bold tabular-nums">{preview.duplicates}</dd>
            </div>
            <div className="rounded border border-steel-200 bg-steel-50 p-3">
              <dt className="text-steel-600">Problems</dt>
              <dd className="text-2xl font-bold tabular-nums">{preview.errorCount}</dd>
            </div>
          </dl>
          <p className="text-sm text-steel-700">
            Columns read: {preview.columns.map((c) => (c.header.trim() === c.column ? c.column : `${c.header} → ${c.column}`)).join(', ')}. Meters:{' '}
            {preview.meters.map((m) => `${m.machineCode}/${m.meterCode} (${m.rows} rows, ${m.unit})`).join('; ') || 'none'}.
          </p>
          {preview.errorCount > 0 ? (
            <div>
              <h3 className="mb-2 text-lg font-bold">
                Problems{preview.errorCount > preview.errors.length ? ` (first ${preview.errors.length} of ${preview.errorCount})` : ''}
              </h3>
              <DataTable caption="Problems in the file" columns={errorColumns} data={preview.errors} getRowId={(e) => `${e.line}-${e.column}-${e.message}`} />
            </div>
          ) : null}
          <div>
            <h3 className="mb-2 text-lg font-bold">First rows as read</h3>
            {preview.errorCount > 0 ? <p className="mb-2 text-sm text-steel-700">Rows that could not be read are in the problem list above.</p> : null}
            <DataTable
              caption="First rows of the file"
              columns={sampleColumns(preview.errorCount > 0)}
              data={preview.sample}
              getRowId={(r) => String(r.line)}
            />
          </div>
          <Button onClick={runImport} disabled={preview.errorCount > 0 || preview.toAdd === 0 || busy} busy={importM.isPending}>
            Import {preview.toAdd} reading{preview.toAdd === 1 ? '' : 's'}
          </Button>
        </section>
      ) : null}
    </div>
  );
}
