import multer from 'multer';
import type { Request, RequestHandler, Response } from 'express';
import { route, type ApiRouter } from '../../http/route';
import { requestEm } from '../../db';
import { AppError, badRequest } from '../../http/errors';
import { singleFileToDisk, unreadableMultipart } from '../../http/upload';
import { COUNTER_IMPORT_MAX_BYTES, type ImportStreamLine } from '../../../shared/schemas/counter-import';
import { counterImportTemplate, importCounterCsv, previewCounterCsv, type Progress } from './counter-import.service';

const receiveToDisk = singleFileToDisk('file', COUNTER_IMPORT_MAX_BYTES, (err, next) => {
  if (err instanceof multer.MulterError) {
    if (err.code === 'LIMIT_FILE_SIZE')
      return next(
        new AppError(
          413,
          'payload_too_large',
          `The file is larger than ${COUNTER_IMPORT_MAX_BYTES / 1024 / 1024} MB. Split it into smaller files; each is imported on its own.`,
          [{ path: 'file', message: 'File larger than 50 MB' }],
        ),
      );
    return next(badRequest(`Upload refused: ${err.message}`, [{ path: 'file', message: err.message }]));
  }
  next(err);
});

/** Streams the upload to a temporary file; multer's own errors become clear HTTP answers (413 for a file over the cap). */
const receiveFile: RequestHandler = (req, res, next) => {
  if (!req.is('multipart/form-data'))
    return next(
      new AppError(415, 'unsupported_media_type', 'Send the CSV file as multipart/form-data (form field “file”)', [
        { path: 'file', message: 'Send the file as multipart/form-data' },
      ]),
    );
  receiveToDisk(req, res, (err?: unknown) => {
    if (err) return next(err instanceof AppError ? err : unreadableMultipart(err, 'file'));
    if (!req.file) return next(badRequest('Choose a CSV file to upload (form field “file”)', [{ path: 'file', message: 'Choose a CSV file' }]));
    next();
  });
};

/**
 * With `Accept: application/x-ndjson` the answer is a stream of progress lines and then the
 * outcome (errors included, since the status line is already sent); otherwise plain JSON.
 */
async function answer(req: Request, res: Response, work: (progress?: Progress) => Promise<ImportStreamLine>) {
  if (!req.accepts(['application/json', 'application/x-ndjson']) || !/x-ndjson/.test(req.get('accept') ?? '')) {
    const line = await work();
    return res.status(200).json(line.type === 'preview' ? line.preview : line.type === 'result' ? line.result : line);
  }
  res.status(200).type('application/x-ndjson').setHeader('Cache-Control', 'no-store');
  res.flushHeaders();
  const write = (l: ImportStreamLine) => res.write(`${JSON.stringify(l)}\n`);
  try {
    write(await work((p) => void write({ type: 'progress', ...p })));
  } catch (err) {
    if (err instanceof AppError) write({ type: 'error', status: err.status, error: err.code, message: err.message, fields: err.fields });
    else {
      req.log?.error({ err }, 'counter import failed');
      write({ type: 'error', status: 500, error: 'internal', message: 'Something went wrong on our side. It has been logged.' });
    }
  }
  res.end();
}

export function registerCounterImportRoutes(r: ApiRouter) {
  route(r, 'get', '/counter-import/template', { access: 'machines.read' }, async (_req, res) => {
    res
      .type('text/csv')
      .attachment('kerfbook-counter-import.csv')
      .send(await counterImportTemplate(requestEm()));
  });
  route(r, 'post', '/counter-import/preview', { access: 'readings.import', before: [receiveFile] }, async (req, res, { principal: who }) => {
    await answer(req, res, async (progress) => ({ type: 'preview', preview: await previewCounterCsv(requestEm(), who, req.file!.path, progress) }));
  });
  route(r, 'post', '/counter-import', { access: 'readings.import', before: [receiveFile] }, async (req, res, { principal: who }) => {
    await answer(req, res, async (progress) => ({ type: 'result', result: await importCounterCsv(requestEm(), who, req.file!.path, progress) }));
  });
}
