// What a run tells the person who started it. On a terminal: a live bar (cases done of total,
// the cases running, elapsed time and ETA) with finished cases' lines scrolling above it. Into a
// log file or a scheduler's output: one line per finished case. Quiet: only problems and the end.
// Everything printed may hold text from a job file (names, case ids, values quoted in warnings and
// errors), so every line goes through safe-text: a job file must not write to the terminal.
import { safeEcho, safeLines } from '../safe-text.js';

/**
 * Longest line, and most lines, printed for one message. Only a guard: the planner's own sentences
 * are far shorter and a job file's refusal lists at most 20 problems (values from input inside
 * them are cut where they are quoted), so no real message is cut.
 */
export const LINE_MAX = 4000;
export const LINES_MAX = 50;

/**
 * A message (error, warning, note) as printed: line by line (a refusal lists its problems on lines
 * of their own), each line's control characters escaped and its length bounded by LINE_MAX.
 */
export function safeMessage(message: string, maxLines: number = LINES_MAX): string {
  return safeLines(message, maxLines, LINE_MAX);
}

const text = (message: string) => safeMessage(message);
/** A value from input (job name, case id): escaped and cut to the usual echo length. */
const value = (v: string) => safeEcho(v);
/** A folder (from --out and the job's name): escaped, newlines included, and cut only if absurd. */
const folderName = (f: string) => safeEcho(f, 1000);

export interface RunReporter {
  jobStart(job: string, folder: string, total: number, skipped: number, workers: number): void;
  caseStart(id: string): void;
  caseDone(id: string, lines: string[], warnings: number): void;
  caseFailed(id: string, error: string): void;
  /** A problem or an announcement that always shows (refusals, memory decisions, resume hints). */
  note(line: string): void;
  jobEnd(line: string): void;
}

export const silentReporter: RunReporter = {
  jobStart() {},
  caseStart() {},
  caseDone() {},
  caseFailed() {},
  note() {},
  jobEnd() {},
};

/** Every event as plain lines (for logs, and for the library's `log` option). */
export function lineReporter(log: (line: string, problem: boolean) => void, quiet = false): RunReporter {
  let total = 0;
  let n = 0;
  return {
    jobStart(job, folder, t, skipped, workers) {
      total = t;
      n = skipped;
      if (!quiet) {
        log(`job ${value(job)}: ${t} case${t === 1 ? '' : 's'}${skipped ? `, ${skipped} already done (skipped)` : ''}, ${workers} worker${workers === 1 ? '' : 's'} → ${folderName(folder)}`, false);
      }
    },
    caseStart() {},
    caseDone(id, lines) {
      n++;
      if (quiet) return;
      log(`[${n}/${total}] ${value(id)}  ${text(lines[0] ?? '')}`, false);
      for (const l of lines.slice(1)) log(`    ${text(l)}`, false);
    },
    caseFailed(id, error) {
      // Always shown, --quiet or not: the reason is the one thing a failed case leaves to read.
      n++;
      log(`[${n}/${total}] ${value(id)}  FAILED: ${text(error)}`, true);
    },
    note(line) {
      log(text(line), true);
    },
    jobEnd(line) {
      log(text(line), false);
    },
  };
}

function clock(seconds: number): string {
  if (!Number.isFinite(seconds)) return '--:--';
  const s = Math.round(seconds);
  const h = Math.floor(s / 3600);
  const m = Math.floor((s % 3600) / 60);
  const r = s % 60;
  return h ? `${h}:${String(m).padStart(2, '0')}:${String(r).padStart(2, '0')}` : `${m}:${String(r).padStart(2, '0')}`;
}

/** The live bar: redrawn in place on `out` (a terminal), with other lines printed above it. */
export function terminalReporter(out: NodeJS.WriteStream, err: NodeJS.WriteStream, quiet = false): RunReporter {
  let total = 0;
  let done = 0;
  let startDone = 0;
  let failed = 0;
  let t0 = Date.now();
  const running = new Set<string>();
  let timer: NodeJS.Timeout | undefined;
  let job = '';
  const width = () => Math.max(40, (out.columns ?? 100) - 1);
  const bar = () => {
    const frac = total ? done / total : 1;
    const cells = 20;
    const fill = Math.round(frac * cells);
    const elapsed = (Date.now() - t0) / 1000;
    const thisRun = done - startDone;
    const eta = thisRun > 0 ? (elapsed / thisRun) * (total - done) : NaN;
    const names = [...running].slice(0, 3).map(value).join(', ') + (running.size > 3 ? ` +${running.size - 3}` : '');
    // The numbers first: a narrow terminal cuts the end of the line.
    const text =
      `${done}/${total}${failed ? ` (${failed} failed)` : ''} [${'#'.repeat(fill)}${'-'.repeat(cells - fill)}] ` +
      `${clock(elapsed)} elapsed, ETA ${clock(eta)} · ${value(job)}${names ? ` · running ${names}` : ''}`;
    return text.length > width() ? `${text.slice(0, width() - 1)}…` : text;
  };
  const draw = () => out.write(`\r\x1b[2K${bar()}`);
  const above = (line: string, stream: NodeJS.WriteStream) => {
    out.write('\r\x1b[2K');
    stream.write(`${line}\n`);
    draw();
  };
  return {
    jobStart(j, folder, t, skipped, workers) {
      job = j;
      total = t;
      done = skipped;
      startDone = skipped;
      failed = 0;
      t0 = Date.now();
      running.clear();
      if (!quiet) above(`job ${value(j)}: ${t} cases${skipped ? `, ${skipped} already done` : ''}, ${workers} worker${workers === 1 ? '' : 's'} → ${folderName(folder)}`, out);
      timer = setInterval(draw, 1000);
      timer.unref();
    },
    caseStart(id) {
      running.add(id);
      draw();
    },
    caseDone(id, lines) {
      running.delete(id);
      done++;
      if (!quiet) above([`${value(id)}  ${text(lines[0] ?? '')}`, ...lines.slice(1).map((l) => `    ${text(l)}`)].join('\n'), out);
      else draw();
    },
    caseFailed(id, error) {
      running.delete(id);
      done++;
      failed++;
      // Always shown, --quiet or not.
      above(`${value(id)}  FAILED: ${text(error)}`, err);
    },
    note(line) {
      above(text(line), err);
    },
    jobEnd(line) {
      if (timer) clearInterval(timer);
      out.write('\r\x1b[2K');
      out.write(`${text(line)}\n`);
    },
  };
}
