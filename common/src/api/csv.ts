/**
 * CSV writing for exports, through csv-stringify (the writer of the csv-parse family we read uploads
 * with): RFC 4180 quoting, CRLF line ends. Text cells that start with = + - @ (or a tab/CR) get an
 * apostrophe in front so a spreadsheet shows them as text instead of running them as formulas (the
 * usual defence against CSV formula injection). Numbers stay numbers; dates are ISO 8601 in UTC.
 */
import { stringify, type Options } from 'csv-stringify/sync';

const neutralise = (s: string): string => (/^[=+\-@\t\r]/.test(s) ? `'${s}` : s);

export const CSV_OPTIONS: Options = {
  record_delimiter: 'windows',
  // Also quote line breaks inside a cell (the writer checks only for CRLF), what a spreadsheet in a
  // semicolon locale would split, and edge spaces it would trim.
  quoted_match: [/;/, /[\r\n]/, /^\s|\s$/],
  cast: {
    string: (s) => neutralise(s),
    number: (n) => (Number.isFinite(n) ? String(n) : ''),
    bigint: (n) => String(n),
    boolean: (b) => (b ? 'true' : 'false'),
    date: (d) => d.toISOString(),
    object: (o) => neutralise(JSON.stringify(o)),
  },
};

/** One record, with its line end. */
export function csvLine(cells: readonly unknown[]): string {
  return stringify([cells as unknown[]], CSV_OPTIONS);
}

/** One cell as it appears in a record (quoted and neutralised as needed). */
export function csvCell(value: unknown): string {
  return csvLine([value]).replace(/\r\n$/, '');
}

export function toCsv(header: string[], rows: unknown[][]): string {
  return stringify([header, ...rows], CSV_OPTIONS);
}
