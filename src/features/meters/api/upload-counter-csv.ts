import { useMutation, useQueryClient } from '@tanstack/react-query';
import { ApiError } from '../../../lib/api-client';
import type { ImportPreview, ImportResult, ImportStreamLine } from '../../../../shared/schemas/counter-import';
import { queryRoots } from '../../../lib/query-keys';
import { meterKeys } from './keys';
import type { ApiErrorBody } from '../../../../shared/schemas/common';

export type UploadProgress = { phase: 'uploading' | 'reading' | 'checking' | 'writing'; done: number; total: number };

async function csrf(): Promise<string> {
  const res = await fetch('/api/auth/csrf', { credentials: 'same-origin' });
  return ((await res.json()) as { token: string }).token;
}

/**
 * Sends the file with XMLHttpRequest, which reports upload progress, and reads the server's
 * NDJSON answer as it arrives: progress lines while it checks and writes, then the outcome.
 */
async function uploadCsv<T>(path: string, file: File, onProgress: (p: UploadProgress) => void): Promise<T> {
  const token = await csrf();
  return new Promise<T>((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    let seen = 0;
    let outcome: ImportStreamLine | null = null;
    const consume = () => {
      const text = xhr.responseText;
      const end = text.lastIndexOf('\n');
      if (end < seen) return;
      for (const raw of text.slice(seen, end).split('\n')) {
        if (!raw.trim()) continue;
        const line = JSON.parse(raw) as ImportStreamLine;
        if (line.type === 'progress') onProgress({ phase: line.phase, done: line.done, total: line.total });
        else outcome = line;
      }
      seen = end + 1;
    };
    xhr.open('POST', `/api${path}`);
    xhr.setRequestHeader('Accept', 'application/x-ndjson');
    xhr.setRequestHeader('X-CSRF-Token', token);
    xhr.upload.onprogress = (e) => onProgress({ phase: 'uploading', done: e.loaded, total: e.lengthComputable ? e.total : file.size });
    xhr.onprogress = consume;
    xhr.onerror = () => reject(new ApiError(0, 'network', 'Could not reach the server. Check the connection and try again.'));
    xhr.onload = () => {
      if (xhr.status !== 200) {
        // Refused before streaming began (size cap, columns, permissions): a JSON error body.
        let body: Partial<ApiErrorBody> = {};
        try {
          body = JSON.parse(xhr.responseText);
        } catch {
          /* not JSON */
        }
        return reject(new ApiError(xhr.status, body.error ?? 'unknown', body.message ?? `Upload failed (${xhr.status})`, body.fields ?? []));
      }
      consume();
      const o = outcome as ImportStreamLine | null;
      if (!o) return reject(new ApiError(500, 'unknown', 'The server ended the answer early'));
      if (o.type === 'error') return reject(new ApiError(o.status, o.error, o.message, o.fields ?? []));
      resolve((o.type === 'preview' ? o.preview : o.type === 'result' ? o.result : null) as T);
    };
    const form = new FormData();
    form.append('file', file);
    xhr.send(form);
  });
}

export const previewCounterCsv = (file: File, onProgress: (p: UploadProgress) => void) => uploadCsv<ImportPreview>('/counter-import/preview', file, onProgress);
export const importCounterCsv = (file: File, onProgress: (p: UploadProgress) => void) => uploadCsv<ImportResult>('/counter-import', file, onProgress);

export function usePreviewCounterCsv() {
  return useMutation({ mutationFn: ({ file, onProgress }: { file: File; onProgress: (p: UploadProgress) => void }) => previewCounterCsv(file, onProgress) });
}

export function useImportCounterCsv() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ file, onProgress }: { file: File; onProgress: (p: UploadProgress) => void }) => importCounterCsv(file, onProgress),
    onSuccess: () =>
      Promise.all([
        qc.invalidateQueries({ queryKey: meterKeys.all }),
        qc.invalidateQueries({ queryKey: queryRoots.machines }),
        qc.invalidateQueries({ queryKey: queryRoots.station }),
      ]),
  });
}
