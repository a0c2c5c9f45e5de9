import { describe, expect, it } from 'vitest';
import { csvCell, toCsv } from './csv';

describe('csv export', () => {
  it('neutralises cells that a spreadsheet would run as formulas (OWASP CSV injection guidance)', () => {
    expect(csvCell('=HYPERLINK("http://x")')).toBe(`"'=HYPERLINK(""http://x"")"`);
    expect(csvCell('+1+2')).toBe("'+1+2");
    expect(csvCell('-2+3')).toBe("'-2+3");
    expect(csvCell('@SUM(A1)')).toBe("'@SUM(A1)");
  });
  it('keeps numbers as numbers, negative ones included', () => {
    expect(csvCell(-12.5)).toBe('-12.5');
    expect(csvCell(Number.NaN)).toBe('');
  });
  it('quotes commas, quotes and line breaks (RFC 4180)', () => {
    expect(
      toCsv(
        ['a', 'b'],
        [
          ['x,y', 'say "hi"'],
          ['line\nbreak', 3],
        ],
      ),
    ).toBe('a,b\r\n"x,y","say ""hi"""\r\n"line\nbreak",3\r\n');
  });
});
