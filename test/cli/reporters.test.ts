// What the run prints is safe whatever a job file holds: the line reporter (logs, pipes) and the
// terminal reporter (a live bar) escape control characters in names, ids, lines, warnings and
// errors, keep a multi-line refusal on lines of its own, and print every failed case's reason,
// --quiet or not. Fake streams stand in for the terminal.
import { describe, expect, it } from 'vitest';
import { LINE_MAX, LINES_MAX, lineReporter, safeMessage, terminalReporter } from '../../src/run/progress.js';

// A job file's hostile text: a screen clear, a colour change, a title-setting OSC sequence, BEL, NUL.
const HOSTILE = '\x1b[2J\x1b[31mred\x1b]0;owned\x07\x00';
const ESCAPED = '\\x1b[2J\\x1b[31mred\\x1b]0;owned\\x07\\x00';

function collect(quiet: boolean) {
  const lines: { line: string; problem: boolean }[] = [];
  const r = lineReporter((line, problem) => lines.push({ line, problem }), quiet);
  return { r, lines };
}

function fakeStream() {
  const chunks: string[] = [];
  const s = { columns: 200, isTTY: true, write: (c: string) => (chunks.push(String(c)), true) } as unknown as NodeJS.WriteStream;
  return { s, text: () => chunks.join('') };
}

describe('safeMessage', () => {
  it('escapes each line and keeps the lines apart', () => {
    expect(safeMessage(`a.yaml:1:7: name: ${HOSTILE}\nb.yaml:2:1: x: bad`)).toBe(`a.yaml:1:7: name: ${ESCAPED}\nb.yaml:2:1: x: bad`);
  });
  it('leaves a long sentence of our own whole up to LINE_MAX, and bounds lines and their count', () => {
    const sentence = 'the window holds every propagating beam. '.repeat(60); // 2460 characters
    expect(safeMessage(sentence)).toBe(sentence);
    const huge = 'x'.repeat(100_000);
    const cut = safeMessage(huge);
    expect(cut.length).toBeLessThan(LINE_MAX + 40);
    expect(cut).toContain('(100000 characters)');
    const many = safeMessage(Array.from({ length: 1000 }, (_, i) => `line ${i}`).join('\n'));
    expect(many.split('\n')).toHaveLength(LINES_MAX + 1);
    expect(many).toMatch(/…\(950 more lines\)$/);
  });
});

describe('lineReporter', () => {
  it('escapes the job name, folder, case id, result lines, warnings, notes and errors', () => {
    const { r, lines } = collect(false);
    r.jobStart(`job${HOSTILE}`, `/out/${HOSTILE}`, 2, 0, 1);
    r.caseDone(`1_${HOSTILE}`, [`far-field ${HOSTILE}`, `! [w] ${HOSTILE}`], 1);
    r.caseFailed(`2_${HOSTILE}`, `f.yaml: ${HOSTILE}\nsecond line ${HOSTILE}`);
    r.note(`note ${HOSTILE}`);
    r.jobEnd(`end ${HOSTILE}`);
    const all = lines.map((l) => l.line).join('\n');
    expect(all).not.toMatch(/[\x00-\x08\x0b-\x1f\x7f]/);
    expect(all.split(ESCAPED).length - 1).toBe(10);
    // The failure: on the problem channel, its two lines kept as two lines.
    const failed = lines.find((l) => l.line.includes('FAILED'))!;
    expect(failed.problem).toBe(true);
    expect(failed.line).toBe(`[2/2] 2_${ESCAPED}  FAILED: f.yaml: ${ESCAPED}\nsecond line ${ESCAPED}`);
  });

  it('--quiet: the failed case and its reason still show, finished cases do not', () => {
    const { r, lines } = collect(true);
    r.jobStart('j', '/out/j', 2, 0, 1);
    r.caseDone('1', ['fine'], 0);
    r.caseFailed('2', 'the grid needs 69767567488 values');
    r.jobEnd('job j: 1 of 2 done, 1 failed');
    expect(lines.map((l) => l.line)).toEqual(['[2/2] 2  FAILED: the grid needs 69767567488 values', 'job j: 1 of 2 done, 1 failed']);
  });
});

describe('terminalReporter', () => {
  it.each([false, true])('quiet %s: the failure and its reason on stderr, escaped; no hostile text raw anywhere', (quiet) => {
    const out = fakeStream();
    const err = fakeStream();
    const r = terminalReporter(out.s, err.s, quiet);
    r.jobStart(`job${HOSTILE}`, `/out/${HOSTILE}`, 2, 0, 2);
    r.caseStart(`1_${HOSTILE}`);
    r.caseStart(`2_${HOSTILE}`);
    r.caseDone(`1_${HOSTILE}`, [`far-field ${HOSTILE}`, `! [w] ${HOSTILE}`], 1);
    r.caseFailed(`2_${HOSTILE}`, `the worker computing it stopped: ${HOSTILE}`);
    r.note(`note ${HOSTILE}`);
    r.jobEnd(`end ${HOSTILE}`);
    // The reporter's own control sequences (carriage return, erase line) are the only ones written.
    const own = (t: string) => t.replaceAll('\r\x1b[2K', '');
    for (const t of [out.text(), err.text()]) expect(own(t)).not.toMatch(/[\x00-\x09\x0b-\x1f\x7f]/);
    expect(err.text()).toContain(`2_${ESCAPED}  FAILED: the worker computing it stopped: ${ESCAPED}\n`);
    expect(err.text()).toContain(`note ${ESCAPED}\n`);
    expect(out.text()).toContain(`end ${ESCAPED}\n`);
    if (!quiet) expect(out.text()).toContain(`1_${ESCAPED}  far-field ${ESCAPED}\n    ! [w] ${ESCAPED}\n`);
    else expect(out.text()).not.toContain('far-field');
  });
});
