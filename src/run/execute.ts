// One case from plan to written folder, the same on a worker thread and in the main thread.
import { summaryOf, writeCase, type CaseSummary } from '../output/case-output.js';
import type { Plan } from '../plan/types.js';
import { runPlannedCase } from './run-case.js';
import { answerQuestions } from './searches.js';
import type { CaseContext } from './context.js';
import { prepareShare, writtenValues, type PreparedShare, type ReportShare } from '../report/case-share.js';

export interface CaseTask {
  plan: Plan;
  jobDir: string;
  hash: string;
  /** What the job report will want of this case, made here from its map (report/case-share.ts). */
  report?: ReportShare;
}

export interface CaseDone {
  id: string;
  summary: CaseSummary;
  report?: PreparedShare;
}

/**
 * Fault injection for the failure-isolation tests: SPOTCAST_FAULT=crash:<case id> makes the
 * worker running that case die, throw:<case id> makes the case throw. Never set in normal use.
 */
function injectFault(id: string): void {
  const f = process.env.SPOTCAST_FAULT;
  if (!f) return;
  const [kind, target] = f.split(':');
  if (target !== id) return;
  if (kind === 'crash') process.exit(70);
  if (kind === 'throw') throw new Error(`fault injected for ${id} (SPOTCAST_FAULT)`);
}

export async function executeCase(task: CaseTask, ctx: CaseContext): Promise<CaseDone> {
  injectFault(task.plan.case.id);
  const rec = runPlannedCase(task.plan, ctx);
  answerQuestions(rec, ctx);
  await writeCase(task.jobDir, rec, task.hash);
  const summary = summaryOf(rec);
  if (!task.report) return { id: task.plan.case.id, summary };
  const m = rec.computed;
  const written = writtenValues(m.intensity, task.plan.case.output.npy);
  return { id: task.plan.case.id, summary, report: prepareShare(task.report, summary, written, m.ny, m.nx) };
}
