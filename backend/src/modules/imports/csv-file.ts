import { createHash } from 'node:crypto';
import { createReadStream } from 'node:fs';
import { parse as parseStream } from 'csv-parse';
import { parse as parseSync } from 'csv-parse/sync';
import { badRequest } from '../../errors/app-error';

/** What one pass over the uploaded bytes tells us before any row is read. */
export interface FileInspection {
  sha256: string;
  sizeBytes: number;
  /** Lines in the file (the header included; a last line without a newline counts). */
  lineCount: number;
  separator: ',' | ';';
  header: string[];
  /** The first records after the header, as text, for the mapping screen. */
  sample: string[][];
}

const SAMPLE_ROWS = 8;
/** The longest line read, in characters; a longer one is refused rather than read without bound. */
export const MAX_LINE_CHARS = 64 * 1024;
/** Enough of the start for a header and a first data line of the limit each, with their line ends. */
const HEAD_BYTES = 2 * (MAX_LINE_CHARS + 2);

function lineTooLong(line: number) {
  return badRequest(
    `The file cannot be read: line ${line} is too long (limit ${MAX_LINE_CHARS.toLocaleString('en-GB')} characters). Check that it is a CSV export with one record per line`,
    [{ path: 'file', message: `line ${line} too long (limit ${MAX_LINE_CHARS})` }],
  );
}

/**
 * Reads an uploaded file once: SHA-256 of its bytes, strict UTF-8 check (a UTF-8 BOM is allowed and
 * skipped; UTF-16 and 8-bit encodings are refused with a message saying how to save the file), line
 * count, separator (comma or semicolon, whichever the header uses more outside quotes), header and a
 * few sample records. Streams, so memory stays flat for any size.
 */
export async function inspectCsvFile(path: string): Promise<FileInspection> {
  const hash = createHash('sha256');
  const decoder = new TextDecoder('utf-8', { fatal: true });
  let size = 0;
  let lines = 0;
  let lastByte = -1;
  let head = '';
  let lineAtChunk = 1;
  for await (const chunk of createReadStream(path, { highWaterMark: 1 << 20 }) as AsyncIterable<Buffer>) {
    if (size === 0) {
      if ((chunk[0] === 0xff && chunk[1] === 0xfe) || (chunk[0] === 0xfe && chunk[1] === 0xff)) {
        throw badRequest('The file is UTF-16 text, not UTF-8: in your spreadsheet choose “Save as → CSV UTF-8 (comma delimited)” and upload that file', [
          { path: 'file', message: 'UTF-16 encoding' },
        ]);
      }
    }
    hash.update(chunk);
    try {
      const text = decoder.decode(chunk, { stream: true });
      if (head.length < HEAD_BYTES) head += text.slice(0, HEAD_BYTES - head.length);
    } catch {
      // Find the first offending byte to name its line.
      const bad = firstInvalidUtf8(chunk);
      let line = lineAtChunk;
      for (let i = 0; i < bad && i < chunk.length; i++) if (chunk[i] === 0x0a) line++;
      const byte = chunk[bad] ?? 0;
      throw badRequest(
        `The file is not UTF-8 text: line ${line} has the byte 0x${byte.toString(16).toUpperCase().padStart(2, '0')}, which suggests Windows-1252 or Latin-1 (e.g. “é” or “°”). In your spreadsheet choose “Save as → CSV UTF-8” and upload that file`,
        [{ path: 'file', message: `not UTF-8 (line ${line})` }],
      );
    }
    for (let i = 0; i < chunk.length; i++) if (chunk[i] === 0x0a) lines++;
    lineAtChunk = lines + 1;
    lastByte = chunk[chunk.length - 1];
    size += chunk.length;
  }
  try {
    decoder.decode();
  } catch {
    throw badRequest('The file is not UTF-8 text (it ends in the middle of a character): save it as “CSV UTF-8” and upload again', [
      { path: 'file', message: 'not UTF-8' },
    ]);
  }
  if (size > 0 && lastByte !== 0x0a) lines++;
  if (head.charCodeAt(0) === 0xfeff) head = head.slice(1);
  if (head.trim() === '') throw badRequest('The file is empty: it has no header and no rows', [{ path: 'file', message: 'empty file' }]);
  if (head.includes('\u0000'))
    throw badRequest('The file holds binary data, not CSV text: export it from the spreadsheet as CSV UTF-8', [
      { path: 'file', message: 'not a CSV text file' },
    ]);

  // Every line of the head (the last one may be cut off, but is then at least this long) within the limit.
  const headLines = head.split('\n');
  for (let i = 0; i < headLines.length; i++) if (headLines[i].replace(/\r$/, '').length > MAX_LINE_CHARS) throw lineTooLong(i + 1);
  const firstLine = head.split(/\r?\n/, 1)[0];
  const separator = sniffSeparator(firstLine);
  // Parse only complete lines of the head (the last one may be cut off).
  const cut = head.length >= HEAD_BYTES ? head.slice(0, head.lastIndexOf('\n') + 1) : head;
  let records: string[][];
  try {
    records = parseSync(cut, {
      delimiter: separator,
      relax_column_count: true,
      relax_quotes: true,
      skip_empty_lines: true,
      to_line: SAMPLE_ROWS + 1,
    }) as string[][];
  } catch (e) {
    throw badRequest(`The file cannot be read as CSV: ${(e as Error).message}`, [{ path: 'file', message: 'not CSV' }]);
  }
  const header = (records[0] ?? []).map((h) => h.trim());
  if (header.length === 0 || header.every((h) => h === ''))
    throw badRequest('The first line of the file is empty: it should hold the column names', [{ path: 'file', message: 'no header' }]);
  const sample = records.slice(1);
  if (sample.length === 0) throw badRequest('The file has a header row but no data rows', [{ path: 'file', message: 'no rows' }]);
  return { sha256: hash.digest('hex'), sizeBytes: size, lineCount: lines, separator, header, sample };
}

function firstInvalidUtf8(buf: Buffer): number {
  let i = 0;
  while (i < buf.length) {
    const b = buf[i];
    const need = b < 0x80 ? 0 : b >= 0xc2 && b < 0xe0 ? 1 : b >= 0xe0 && b < 0xf0 ? 2 : b >= 0xf0 && b < 0xf5 ? 3 : -1;
    if (need < 0) return i;
    for (let k = 1; k <= need; k++) {
      if (i + k >= buf.length) return i + k; // cut at the chunk edge: report where it breaks
      if ((buf[i + k] & 0xc0) !== 0x80) return i;
    }
    i += need + 1;
  }
  return 0;
}

/** Comma or semicolon: whichever the header line has more of outside quotes (comma on a tie). */
export function sniffSeparator(line: string): ',' | ';' {
  let commas = 0;
  let semis = 0;
  let quoted = false;
  for (const ch of line) {
    if (ch === '"') quoted = !quoted;
    else if (!quoted && ch === ',') commas++;
    else if (!quoted && ch === ';') semis++;
  }
  return semis > commas ? ';' : ',';
}

/**
 * The data records of a file, streamed (csv-parse, back-pressured by the consumer) in chunks of the
 * records parsed so far — one await per chunk rather than per record keeps the loop cheap — each
 * record with its line number as a spreadsheet shows it (the header is line 1). Empty lines are passed
 * through as `[""]` so the numbering stays true; a quoted cell spanning lines shifts later numbers
 * (rare in these exports).
 */
export async function* readCsvChunks(path: string, separator: ',' | ';'): AsyncGenerator<{ firstLine: number; records: string[][] }> {
  const parser = createReadStream(path, { highWaterMark: 1 << 20 }).pipe(
    parseStream({
      delimiter: separator,
      bom: true,
      relax_column_count: true,
      relax_quotes: true,
      skip_empty_lines: false,
      from_line: 2,
      max_record_size: MAX_LINE_CHARS,
    }),
  );
  let line = 2;
  let failure: Error | null = null;
  let ended = false;
  let wake: (() => void) | null = null;
  parser.on('readable', () => wake?.());
  parser.on('end', () => {
    ended = true;
    wake?.();
  });
  parser.on('error', (e: Error) => {
    failure = e;
    wake?.();
  });
  try {
    for (;;) {
      const records: string[][] = [];
      let r: string[] | null;
      while (records.length < 4096 && (r = parser.read() as string[] | null) !== null) records.push(r);
      if (records.length) {
        yield { firstLine: line, records };
        line += records.length;
        continue;
      }
      if (failure) throw failure;
      if (ended) return;
      await new Promise<void>((resolve) => {
        wake = resolve;
      });
      wake = null;
    }
  } catch (e) {
    const csv = e as { code?: string; lines?: number };
    if (csv.code === 'CSV_MAX_RECORD_SIZE') throw lineTooLong(csv.lines ?? line);
    throw badRequest(`The file cannot be read as CSV near line ${line}: ${(e as Error).message}`, [{ path: 'file', message: `not CSV at line ${line}` }]);
  } finally {
    parser.destroy();
  }
}

/** Record by record (for callers that do not need the speed of chunks). */
export async function* readCsvRecords(path: string, separator: ',' | ';'): AsyncGenerator<{ line: number; record: string[] }> {
  for await (const { firstLine, records } of readCsvChunks(path, separator)) {
    for (let i = 0; i < records.length; i++) yield { line: firstLine + i, record: records[i] };
  }
}
