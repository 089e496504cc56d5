// CSV quoting per RFC 4180 §2 (Shafranovich, "Common Format and MIME Type for CSV Files", 2005):
// rule 4 fields separated by commas; rule 5 fields may be enclosed in double quotes; rule 6 fields
// containing line breaks, double quotes or commas must be enclosed in double quotes; rule 7 a
// double quote inside a quoted field is escaped by preceding it with another double quote.
// Records end in LF, not the CRLF of rule 1: a deliberate choice of the project (the comment in
// src/output/csv.ts), which common readers accept (common practice).
// When python3 is on the machine, its standard csv module (a general-purpose reference reader)
// parses what we write; that check is skipped otherwise.
import { execFileSync, spawnSync } from 'node:child_process';
import { describe, expect, it } from 'vitest';
import { toCsv } from '../../src/output/csv.js';
import { summaryCsv } from '../../src/output/summary.js';
import { parseJobText } from '../../src/job/load.js';
import { expandJob, sweepAxes } from '../../src/job/expand.js';

describe('toCsv (RFC 4180 §2)', () => {
  it('plain fields are written as they are, comma-separated, one record per line', () => {
    expect(toCsv(['a', 'b', 'c'], [['x', 1, 2.5], ['y', -3, 1e-7]])).toBe('a,b,c\nx,1,2.5\ny,-3,1e-7\n');
  });

  it('rule 6: a comma or a double quote forces quotes', () => {
    expect(toCsv(['v'], [['a,b']])).toBe('v\n"a,b"\n');
    expect(toCsv(['v'], [['x,"y",\nz']])).toBe('v\n"x,""y"",\\x0az"\n');
  });

  it('LF, CR and every other control character in a text cell are written as visible escapes, so a record is one line', () => {
    // Rule 6 would allow a quoted line break, but a cell from a job file must not carry one (nor an
    // escape sequence) into a terminal or a spreadsheet: src/safe-text.ts escapeControl.
    expect(toCsv(['v'], [['line1\nline2']])).toBe('v\nline1\\x0aline2\n');
    expect(toCsv(['v'], [['cr\rhere']])).toBe('v\ncr\\x0dhere\n');
    expect(toCsv(['v'], [['\x1b[2J\x07\x00\u202e']])).toBe('v\n\\x1b[2J\\x07\\x00\\u202e\n');
    expect(toCsv(['a\tb'], [])).toBe('a\\x09b\n');
  });

  it('rule 7: an inner double quote is doubled', () => {
    // The RFC's own example: "aaa","b""bb","ccc" holds b"bb.
    expect(toCsv(['v'], [['b"bb']])).toBe('v\n"b""bb"\n');
    expect(toCsv(['v'], [['"']])).toBe('v\n""""\n');
    expect(toCsv(['v'], [['say "hi", then go']])).toBe('v\n"say ""hi"", then go"\n');
  });

  it('spaces are part of a field (rule 4) and are kept without quotes', () => {
    expect(toCsv(['v', 'w'], [[' lead', 'trail ']])).toBe('v,w\n lead,trail \n');
  });

  it('the header is quoted by the same rules', () => {
    expect(toCsv(['x, m', 'say "y"'], [])).toBe('"x, m","say ""y"""\n');
  });

  it('empty, missing and non-finite values are empty fields; booleans are words', () => {
    expect(toCsv(['a', 'b', 'c', 'd', 'e', 'f', 'g'], [[null, undefined, '', NaN, Infinity, true, false]])).toBe(
      'a,b,c,d,e,f,g\n,,,,,true,false\n',
    );
  });

  it('a text cell a spreadsheet would take for a formula gets a leading apostrophe (src/safe-text.ts guardFormula)', () => {
    // The cells starting with = + - @ (or a tab or CR before one) are the classes the OWASP page
    // "CSV Injection" lists (from memory); the apostrophe prefix is common practice.
    const cells = ['=1+1', '+A1', '-2+3', '@SUM(A1)', '=HYPERLINK("http://x","y")', '\t=1', '\r+1'];
    const text = toCsv(['v'], cells.map((c) => [c]));
    expect(text.trimEnd().split('\n').slice(1)).toEqual(["'=1+1", "'+A1", "'-2+3", "'@SUM(A1)", '"\'=HYPERLINK(""http://x"",""y"")"', "'\\x09=1", "'\\x0d+1"]);
    // Text that does not start with one of them is left alone.
    expect(toCsv(['v'], [['a=1'], ['1-2'], ['x@y']])).toBe('v\na=1\n1-2\nx@y\n');
  });

  it('negative numbers stay numbers: the guard is for text only, decided by the cell type', () => {
    expect(toCsv(['x', 'y'], [[-3, -2.5e-7], [-0.001, -1e300]])).toBe('x,y\n-3,-2.5e-7\n-0.001,-1e+300\n');
    // The same characters as text are guarded: a number written as text is not trusted as one.
    expect(toCsv(['x'], [['-3']])).toBe("x\n'-3\n");
  });

  it('numbers are written so that they read back to the same double', () => {
    const xs = [6.33e-7, 1 / 3, 0.1 + 0.2, 123456789.123, 5e-324, 1.7976931348623157e308];
    const lines = toCsv(['x'], xs.map((x) => [x])).trimEnd().split('\n').slice(1);
    expect(lines.map(Number)).toEqual(xs);
  });
});

const havePython = spawnSync('python3', ['-c', 'import csv, json'], { stdio: 'ignore' }).status === 0;
if (!havePython) console.warn('csv.test.ts: python3 is not available here; the cross-check with its csv module is skipped.');

function readWithPython(text: string): string[][] {
  const code = 'import csv, io, json, sys\nprint(json.dumps(list(csv.reader(io.StringIO(sys.stdin.read(), newline="")))))';
  return JSON.parse(execFileSync('python3', ['-c', code], { input: text, encoding: 'utf8' })) as string[][];
}

describe.skipIf(!havePython)("cross-check with Python's csv module (skipped without python3)", () => {
  it('reads back every awkward field exactly', () => {
    const fields = ['plain', 'a,b', 'b"bb', 'line1\nline2', 'cr\r\nlf', ' spaced ', '', 'µm ≈ 1e-6 m', '=1+1', ',"\n', '-2+3'];
    // What a reader gets back is the text with control characters escaped and formulas guarded.
    const expected = ['plain', 'a,b', 'b"bb', 'line1\\x0aline2', 'cr\\x0d\\x0alf', ' spaced ', '', 'µm ≈ 1e-6 m', "'=1+1", ',"\\x0a', "'-2+3"];
    const text = toCsv(['case', 'note'], fields.map((f, i) => [i, f]));
    expect(readWithPython(text)).toEqual([['case', 'note'], ...expected.map((f, i) => [String(i), f])]);
  });

  it('reads negative numbers back as numbers, not as guarded text', () => {
    const rows = readWithPython(toCsv(['x'], [[-3], [-2.5e-7]]));
    expect(rows.slice(1).map((r) => Number(r[0]))).toEqual([-3, -2.5e-7]);
  });
});

describe('summary.csv', () => {
  const spec = parseJobText(
    'name: s\nwavelength: 633 nm\ndistance: [1 m, 2 m]\naperture: {shape: slit, width: [10 um, 20 um]}\n',
  ).spec;
  const cases = expandJob(spec);
  const axes = sweepAxes(spec).filter((a) => a.values.length > 1);
  const errors = ['grid, as planned, needs 9 GiB; raise "--max-memory"', 'window\ntruncated'];
  const text = summaryCsv(
    axes,
    cases.slice(0, 2).map((c, i) => ({ case: c, error: errors[i]! })),
  );

  it('has the case and the swept keys with units first, then the fixed columns', () => {
    const header = text.split('\n')[0]!.split(',');
    expect(header.slice(0, 2)).toEqual(['case', 'aperture.width_m']);
    expect(header).toContain('status');
    expect(header).toContain('fresnel_number');
    expect(header.at(-1)).toBe('error');
    // wavelength and distance have fixed columns of their own, not a second swept one.
    expect(header.filter((h) => h.startsWith('distance')).length).toBe(1);
  });

  it.skipIf(!havePython)('is one record per case that a CSV reader parses, errors quoted, their line breaks escaped', () => {
    const rows = readWithPython(text);
    const header = rows[0]!;
    expect(rows).toHaveLength(3);
    const col = (name: string) => header.indexOf(name);
    rows.slice(1).forEach((r, i) => {
      expect(r).toHaveLength(header.length);
      expect(r[0]).toBe(cases[i]!.id);
      expect(r[col('status')]).toBe('failed');
      expect(r[col('error')]).toBe(errors[i]!.replace('\n', '\\x0a'));
      expect(Number(r[col('distance_m')])).toBe(cases[i]!.distance);
      expect(Number(r[col('aperture.width_m')])).toBe(cases[i]!.swept['aperture.width']);
    });
  });

  it('guards text cells from input against formulas and escapes their control characters; numbers stay numbers', () => {
    // Case ids are made by the tool today; the guard must not depend on that.
    const hostile = [
      { case: { ...cases[0]!, id: '=1+1' }, error: '-2+3 is not a length' },
      { case: { ...cases[1]!, id: '@SUM(A1)\x1b[2J' }, error: '+A1\x07\x00' },
    ];
    const lines = summaryCsv(axes, hostile).trimEnd().split('\n');
    const header = lines[0]!.split(',');
    const cells = lines.slice(1).map((l) => l.split(','));
    const at = (r: number, name: string) => cells[r]![header.indexOf(name)];
    expect(at(0, 'case')).toBe("'=1+1");
    expect(at(0, 'error')).toBe("'-2+3 is not a length");
    expect(at(1, 'case')).toBe("'@SUM(A1)\\x1b[2J");
    expect(at(1, 'error')).toBe("'+A1\\x07\\x00");
    expect(summaryCsv(axes, hostile)).not.toMatch(/[\x00-\x09\x0b-\x1f\x7f]/);
    expect(Number(at(0, 'distance_m'))).toBe(cases[0]!.distance);
  });
});
