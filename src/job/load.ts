// Reading a job file: YAML or JSON text -> validated JobSpec, or errors that say where (file, line,
// column, key path), what was given and what was expected.
import { readFile } from 'node:fs/promises';
import { LineCounter, parseDocument, isNode, type Document } from 'yaml';
import type { $ZodIssue } from 'zod/v4/core';
import {
  APERTURE_KEYS,
  DETECTOR_KEYS,
  ORDERS_KEYS,
  SEARCH_KEYS,
  SMALLEST_SPOT_KEYS,
  GRID_KEYS,
  ILLUMINATION_KEYS,
  JOB_KEYS,
  OUTPUT_KEYS,
  RANGE_KEYS,
  SHAPE_NAMES,
  ILLUMINATION_KINDS,
  jobSchema,
  type JobSpec,
} from './schema.js';
import { closest } from './suggest.js';

export interface JobProblem {
  /** Key path such as "aperture.diameter" ("" for the whole file). */
  path: string;
  message: string;
  line?: number;
  column?: number;
}

export class JobError extends Error {
  constructor(
    readonly file: string,
    readonly problems: JobProblem[],
  ) {
    super(problems.map((p) => formatProblem(file, p)).join('\n'));
    this.name = 'JobError';
  }
}

export function formatProblem(file: string, p: JobProblem): string {
  const where = p.line !== undefined ? `${file}:${p.line}:${p.column ?? 1}` : file;
  return p.path ? `${where}: ${p.path}: ${p.message}` : `${where}: ${p.message}`;
}

export interface LoadedJob {
  file: string;
  spec: JobSpec;
  /** The job exactly as written (parsed, before units and defaults), echoed into results. */
  given: Record<string, unknown>;
}

export async function loadJobFile(file: string): Promise<LoadedJob> {
  let text: string;
  try {
    text = await readFile(file, 'utf8');
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    const why = code === 'ENOENT' ? 'no such file' : code === 'EISDIR' ? 'is a folder, not a job file' : String(e);
    throw new JobError(file, [{ path: '', message: `cannot read the job file: ${why}` }]);
  }
  return parseJobText(text, file);
}

/** Parses job text (YAML, or JSON, which YAML reads too) and validates it. */
export function parseJobText(text: string, file = '<job>'): LoadedJob {
  const lineCounter = new LineCounter();
  const doc = parseDocument(text, { lineCounter, prettyErrors: true, uniqueKeys: true });
  if (doc.errors.length > 0) {
    throw new JobError(
      file,
      doc.errors.map((err) => {
        const pos = err.linePos?.[0];
        return {
          path: '',
          // The parser's first line repeats the position ("... at line 3, column 1:"), given in front.
          message: `syntax error: ${err.message.split('\n')[0]!.replace(/ at line \d+, column \d+:?\s*$/, '')}`,
          line: pos?.line,
          column: pos?.col,
        };
      }),
    );
  }
  const given = doc.toJS() as unknown;
  if (given === null || typeof given !== 'object' || Array.isArray(given)) {
    throw new JobError(file, [
      { path: '', message: 'expected a job: a mapping of keys such as name, wavelength, distance, aperture' },
    ]);
  }
  return validateJob(given as Record<string, unknown>, file, { doc, lineCounter });
}

interface Positions {
  doc: Document;
  lineCounter: LineCounter;
}

/** Validates an already-parsed job object (the library entry point for scripted jobs). */
export function validateJob(given: Record<string, unknown>, file = '<job>', positions?: Positions): LoadedJob {
  const result = jobSchema.safeParse(given);
  if (result.success) return { file, spec: result.data, given };
  const problems = flattenIssues(result.error.issues).map((issue) => describeIssue(issue, given, positions));
  throw new JobError(file, dedupe(problems));
}

function flattenIssues(issues: readonly $ZodIssue[]): $ZodIssue[] {
  const out: $ZodIssue[] = [];
  for (const issue of issues) {
    // A union reports every branch's failure; the most specific branch is the one whose issues
    // reach deepest, which is what a person meant to write.
    if (issue.code === 'invalid_union' && issue.errors.length > 0) {
      const best = issue.errors
        .map((branch) => branch.map((b) => ({ ...b, path: [...issue.path, ...b.path] }) as $ZodIssue))
        .sort((a, b) => depth(b) - depth(a))[0]!;
      if (depth(best) > issue.path.length) {
        out.push(...flattenIssues(best));
        continue;
      }
      // Nothing went deeper: when the value's type suits exactly one branch (a number where a
      // number or a list is allowed), that branch's complaint is the one that says what is wrong.
      const fitting = issue.errors.filter((branch) => !isTypeMiss(branch));
      if (fitting.length === 1) {
        out.push(...flattenIssues(fitting[0]!.map((b) => ({ ...b, path: [...issue.path, ...b.path] }) as $ZodIssue)));
        continue;
      }
    }
    out.push(issue);
  }
  return out;
}

const TYPE_NAMES = new Set(['array', 'object', 'tuple', 'number', 'string', 'boolean']);

/** A branch that failed only because the value is of another type than the branch takes. */
function isTypeMiss(branch: $ZodIssue[]): boolean {
  return (
    branch.length === 1 &&
    branch[0]!.code === 'invalid_type' &&
    branch[0]!.path.length === 0 &&
    TYPE_NAMES.has(String(branch[0]!.expected))
  );
}

function depth(branch: $ZodIssue[]): number {
  return Math.max(...branch.map((i) => i.path.length + (i.code === 'custom' ? 0.5 : 0)));
}

function dedupe(problems: JobProblem[]): JobProblem[] {
  const seen = new Set<string>();
  return problems.filter((p) => {
    const key = `${p.path}|${p.message}`;
    if (seen.has(key)) return false;
    seen.add(key);
    return true;
  });
}

function describeIssue(issue: $ZodIssue, given: unknown, positions?: Positions): JobProblem {
  const path = issue.path.map((p) => (typeof p === 'number' ? p : String(p)));
  if (issue.code === 'unrecognized_keys') {
    const known = knownKeysAt(path, given);
    const messages = issue.keys.map((k) => {
      const hint = closest(k, known);
      return `unknown key '${k}'${hint ? ` (did you mean '${hint}'?)` : ''}; known keys here: ${known.join(', ')}`;
    });
    const keyPath = [...path, issue.keys[0]!];
    return { path: dotted(path), message: messages.join('; '), ...positionOf(keyPath, positions, true) };
  }
  const value = valueAt(given, path);
  let message = issue.message;
  if (issue.code === 'invalid_union' && 'discriminator' in issue && issue.discriminator) {
    // A wrong or missing shape/kind: name the choices and the nearest one.
    const choices = issue.discriminator === 'shape' ? SHAPE_NAMES : ILLUMINATION_KINDS;
    const hint = typeof value === 'string' ? closest(value, choices) : undefined;
    message = `${value === undefined ? 'missing: ' : ''}expected one of ${choices.join(', ')}${hint ? ` (did you mean '${hint}'?)` : ''}`;
  } else if (issue.code === 'invalid_type' && value === undefined) {
    message = `missing: ${message.replace(/^expected /, 'expected ')}`;
  }
  const got = value === undefined ? '' : `, got ${show(value)}`;
  const reason = issue.code === 'custom' ? (issue.params as { reason?: string } | undefined)?.reason : undefined;
  if (reason) return { path: dotted(path), message: `${message}${got}: ${reason}`, ...positionOf(path, positions, false) };
  return { path: dotted(path), message: `${message}${got}`, ...positionOf(path, positions, false) };
}

function knownKeysAt(path: (string | number)[], given: unknown): string[] {
  const key = path.filter((p) => typeof p === 'string').join('.');
  const here = valueAt(given, path) as Record<string, unknown> | undefined;
  switch (key) {
    case '':
      return JOB_KEYS;
    case 'aperture': {
      const shape = here?.shape as keyof typeof APERTURE_KEYS;
      return APERTURE_KEYS[shape] ?? ['shape'];
    }
    case 'illumination': {
      const kind = (here?.kind ?? 'plane') as keyof typeof ILLUMINATION_KEYS;
      return ILLUMINATION_KEYS[kind] ?? ['kind'];
    }
    case 'grid':
      return GRID_KEYS;
    case 'output':
      return OUTPUT_KEYS;
    case 'detector':
      return DETECTOR_KEYS;
    case 'search':
      return SEARCH_KEYS;
    case 'search.smallest-spot':
      return SMALLEST_SPOT_KEYS;
    case 'orders':
      return ORDERS_KEYS;
    default:
      return RANGE_KEYS; // the only other mappings in a job are ranges {from, to, count, spacing}
  }
}

function valueAt(root: unknown, path: (string | number)[]): unknown {
  let v = root;
  for (const p of path) {
    if (v === null || typeof v !== 'object') return undefined;
    v = (v as Record<string | number, unknown>)[p];
  }
  return v;
}

function positionOf(path: (string | number)[], positions: Positions | undefined, preferKey: boolean) {
  if (!positions) return {};
  // Walk up until a node exists (a missing key is reported at its parent).
  for (let n = path.length; n >= 0; n--) {
    const sub = path.slice(0, n);
    const node = sub.length === 0 ? positions.doc.contents : positions.doc.getIn(sub, true);
    let offset: number | undefined;
    if (preferKey && n === path.length && n > 0) offset = keyOffset(positions.doc, sub);
    if (offset === undefined && isNode(node) && node.range) offset = node.range[0];
    if (offset !== undefined) {
      const { line, col } = positions.lineCounter.linePos(offset);
      return { line, column: col };
    }
  }
  return {};
}

function keyOffset(doc: Document, path: (string | number)[]): number | undefined {
  const parent = path.length === 1 ? doc.contents : doc.getIn(path.slice(0, -1), true);
  const items = (parent as { items?: { key?: unknown }[] } | undefined)?.items;
  if (!Array.isArray(items)) return undefined;
  const last = path[path.length - 1];
  for (const item of items) {
    const k = item.key as { value?: unknown; range?: [number, number, number] } | undefined;
    if (k && k.value === last && k.range) return k.range[0];
  }
  return undefined;
}

function dotted(path: (string | number)[]): string {
  return path.map((p, i) => (typeof p === 'number' ? `[${p}]` : i === 0 ? p : `.${p}`)).join('');
}

function show(v: unknown): string {
  if (typeof v === 'string') return `'${v}'`;
  const s = JSON.stringify(v);
  return s === undefined ? String(v) : s.length > 80 ? `${s.slice(0, 77)}...` : s;
}
