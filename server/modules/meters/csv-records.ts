import { createReadStream } from 'node:fs';
import { open, stat } from 'node:fs/promises';
import Papa from 'papaparse';
import { badRequest } from '../../http/errors';

/** One CSV record as Papaparse reads it, with Papaparse's complaint about it if any. */
export type CsvRecord = { cells: string[]; csvError: string | null };
export type CsvBatch = { records: CsvRecord[]; bytesRead: number; totalBytes: number };

/** Papaparse guesses line endings from the first megabyte; the delimiter from the first ten rows. */
const GUESS_BYTES = 1024 * 1024;
/**
 * A record longer than this is an unclosed quote running on through the file; it is
 * reported on its line instead of being re-parsed with every following chunk.
 */
const MAX_RECORD_CHARS = 1024 * 1024;
const READ_CHUNK_BYTES = 256 * 1024;

/** Refuses an empty file and one with NUL bytes (a binary file), reading it a chunk at a time. */
async function checkIsText(path: string): Promise<number> {
  const { size } = await stat(path);
  if (size === 0) throw badRequest('The file is empty', [{ path: 'file', message: 'The file is empty' }]);
  for await (const chunk of createReadStream(path, { highWaterMark: READ_CHUNK_BYTES })) {
    if ((chunk as Buffer).includes(0)) throw badRequest('This is not a CSV text file', [{ path: 'file', message: 'Not a CSV text file' }]);
  }
  return size;
}

/** The delimiter and line ending Papaparse would pick for the whole text, from its start. */
async function guessLayout(path: string): Promise<{ delimiter: string; newline: '\n' | '\r\n' | '\r' }> {
  const handle = await open(path, 'r');
  try {
    const buf = Buffer.alloc(GUESS_BYTES);
    const { bytesRead } = await handle.read(buf, 0, GUESS_BYTES, 0);
    // A multi-byte character cut at the end only costs the last row of the guess, as in Papaparse.
    const head = buf.subarray(0, bytesRead).toString('utf8');
    const { meta } = Papa.parse<string[]>(head, { preview: 10, skipEmptyLines: 'greedy' });
    return { delimiter: meta.delimiter, newline: meta.linebreak as '\n' | '\r\n' | '\r' };
  } finally {
    await handle.close();
  }
}

/** Papaparse's `skipEmptyLines: 'greedy'`: a record of blank fields only is no record. */
const isBlank = (cells: string[]) => cells.join('').trim() === '';

/**
 * Reads a CSV file as Papaparse reads the whole text (RFC 4180 quoting, delimiter and line
 * ending guessed, blank lines skipped, byte-order mark dropped) but a chunk at a time, so
 * memory holds one chunk and one partial record whatever the file size. Each batch holds
 * the complete records of one chunk, in file order.
 */
export async function* readCsvRecords(path: string): AsyncGenerator<CsvBatch> {
  const totalBytes = await checkIsText(path);
  const { delimiter, newline } = await guessLayout(path);
  const parser = new Papa.Parser({ delimiter, newline, quoteChar: '"' }) as unknown as {
    parse(input: string, baseIndex: number, ignoreLastRow: boolean): Papa.ParseResult<string[]>;
  };
  const stream = createReadStream(path, { encoding: 'utf8', highWaterMark: READ_CHUNK_BYTES });
  let partial = '';
  let bytesRead = 0;
  let first = true;
  const take = (input: string, last: boolean): CsvRecord[] => {
    const res = parser.parse(input, 0, !last);
    const errors = new Map<number, string>();
    for (const e of res.errors) if (e.row !== undefined && !errors.has(e.row)) errors.set(e.row, e.message);
    partial = last ? '' : input.substring(res.meta.cursor);
    const out: CsvRecord[] = [];
    res.data.forEach((cells, i) => {
      if (!isBlank(cells)) out.push({ cells, csvError: errors.get(i) ?? null });
    });
    return out;
  };
  for await (const chunk of stream as AsyncIterable<string>) {
    bytesRead += Buffer.byteLength(chunk);
    let text = chunk;
    if (first && text.charCodeAt(0) === 0xfeff) text = text.slice(1);
    first = false;
    const records = take(partial + text, false);
    if (partial.length > MAX_RECORD_CHARS) {
      // An unclosed quote: Papaparse would read the rest of the file as this one record.
      stream.destroy();
      const [long] = take(partial, true);
      records.push({ cells: long?.cells ?? [''], csvError: long?.csvError ?? `A record longer than ${MAX_RECORD_CHARS / 1024 / 1024} MB` });
      yield { records, bytesRead: totalBytes, totalBytes };
      return;
    }
    yield { records, bytesRead, totalBytes };
  }
  if (partial) yield { records: take(partial, true), bytesRead, totalBytes };
}
