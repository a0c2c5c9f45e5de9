import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { MAX_LINE_CHARS, inspectCsvFile, readCsvRecords } from './csv-file';

const dir = mkdtempSync(path.join(tmpdir(), 'plenum-csv-test-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));
let n = 0;
function file(text: string): string {
  const p = path.join(dir, `f${++n}.csv`);
  writeFileSync(p, text);
  return p;
}
async function refusal(p: Promise<unknown>): Promise<string> {
  try {
    await p;
  } catch (e) {
    return (e as Error).message;
  }
  return 'no refusal';
}
async function readAll(p: string) {
  const out: { line: number; record: string[] }[] = [];
  for await (const r of readCsvRecords(p, ',')) out.push(r);
  return out;
}

// Hand-made files around the line limit: a line one character over it is refused with its number and
// the limit, one exactly at it is read.
describe('lines longer than the limit', () => {
  const over = 'x'.repeat(MAX_LINE_CHARS + 1);
  const atLimit = 'y'.repeat(MAX_LINE_CHARS);

  it('refuses an over-long header line as too long, not as an empty first line', async () => {
    const msg = await refusal(inspectCsvFile(file(`${over}\n2027-01-04T00:00,50\n`)));
    expect(msg).toMatch(/line 1 is too long \(limit 65,536 characters\)/);
  });

  it('refuses an over-long first data line as too long, not as a file without data rows', async () => {
    const msg = await refusal(inspectCsvFile(file(`time,level_percent\n2027-01-04T00:00,${over}\n2027-01-04T01:00,49\n`)));
    expect(msg).toMatch(/line 2 is too long \(limit 65,536 characters\)/);
  });

  it('reads a header and a first data line of exactly the limit each', async () => {
    const info = await inspectCsvFile(file(`${atLimit}\r\n2027-01-04T00:00,${atLimit.slice(17)}\r\n`));
    expect(info.header[0]).toHaveLength(MAX_LINE_CHARS);
    expect(info.sample).toHaveLength(1);
  });

  it('stops the streamed read at an over-long later line, naming it', async () => {
    // 10,000 rows of 20 characters put the long line (line 10,002) past the part read by the inspection.
    const rows = Array.from({ length: 10_000 }, () => '2027-01-04T00:00,50');
    const p = file(`time,level_percent\n${rows.join('\n')}\n2027-01-04T10:00,${over}\n`);
    expect((await inspectCsvFile(p)).sample).toHaveLength(8);
    const msg = await refusal(readAll(p));
    expect(msg).toMatch(/line 10002 is too long \(limit 65,536 characters\)/);
  });

  it('streams ordinary lines with their spreadsheet line numbers', async () => {
    const got = await readAll(file('time,level_percent\n2027-01-04T00:00,50\n2027-01-04T01:00,49.5\n'));
    expect(got).toEqual([
      { line: 2, record: ['2027-01-04T00:00', '50'] },
      { line: 3, record: ['2027-01-04T01:00', '49.5'] },
    ]);
  });
});
