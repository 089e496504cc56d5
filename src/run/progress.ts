// What a run tells the person who started it. On a terminal: a live bar (cases done of total,
// the cases running, elapsed time and ETA) with finished cases' lines scrolling above it. Into a
// log file or a scheduler's output: one line per finished case. Quiet: only problems and the end.

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
        log(`job ${job}: ${t} case${t === 1 ? '' : 's'}${skipped ? `, ${skipped} already done (skipped)` : ''}, ${workers} worker${workers === 1 ? '' : 's'} → ${folder}`, false);
      }
    },
    caseStart() {},
    caseDone(id, lines) {
      n++;
      if (quiet) return;
      log(`[${n}/${total}] ${id}  ${lines[0] ?? ''}`, false);
      for (const l of lines.slice(1)) log(`    ${l}`, false);
    },
    caseFailed(id, error) {
      n++;
      log(`[${n}/${total}] ${id}  FAILED: ${error}`, true);
    },
    note(line) {
      log(line, true);
    },
    jobEnd(line) {
      log(line, false);
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
    const names = [...running].slice(0, 3).join(', ') + (running.size > 3 ? ` +${running.size - 3}` : '');
    // The numbers first: a narrow terminal cuts the end of the line.
    const text =
      `${done}/${total}${failed ? ` (${failed} failed)` : ''} [${'#'.repeat(fill)}${'-'.repeat(cells - fill)}] ` +
      `${clock(elapsed)} elapsed, ETA ${clock(eta)} · ${job}${names ? ` · running ${names}` : ''}`;
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
      if (!quiet) above(`job ${j}: ${t} cases${skipped ? `, ${skipped} already done` : ''}, ${workers} worker${workers === 1 ? '' : 's'} → ${folder}`, out);
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
      if (!quiet) above(`${id}  ${lines[0] ?? ''}${lines.length > 1 ? `\n    ${lines.slice(1).join('\n    ')}` : ''}`, out);
      else draw();
    },
    caseFailed(id, error) {
      running.delete(id);
      done++;
      failed++;
      above(`${id}  FAILED: ${error}`, err);
    },
    note(line) {
      above(line, err);
    },
    jobEnd(line) {
      if (timer) clearInterval(timer);
      out.write('\r\x1b[2K');
      out.write(`${line}\n`);
    },
  };
}
