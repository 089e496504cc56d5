// Reading a job file: YAML or JSON text -> validated JobSpec, or errors that say where (file, line,
// column, key path), what was given and what was expected.
//
// The work is bounded by the input: the file is a regular file of at most MAX_JOB_BYTES, read
// without ever blocking (a FIFO or /dev/zero is refused from its stat); every stage after it is
// linear in the text (duplicate keys are found with one set per mapping, not the parser's pairwise
// check); at most MAX_PROBLEMS problems are described (and the rest counted); every value echoed
// in a message is escaped and cut (safe-text.ts).
import { dirname, resolve as resolvePath } from 'node:path';
import { LineCounter, parseDocument, isNode, isMap, isSeq, isScalar, type Document } from 'yaml';
import type { $ZodIssue } from 'zod/v4/core';
import {
  APERTURE_KEYS,
  DETECTOR_KEYS,
  ORDERS_KEYS,
  SEARCH_KEYS,
  SMALLEST_SPOT_KEYS,
  PINHOLE_SEARCH_KEYS,
  PLANE_KEYS,
  GRID_KEYS,
  ILLUMINATION_KEYS,
  JOB_KEYS,
  OUTPUT_KEYS,
  RANGE_KEYS,
  SHAPE_NAMES,
  ILLUMINATION_KINDS,
  WAVELENGTH_USUAL_MAX,
  WAVELENGTH_USUAL_MIN,
  jobSchema,
  quantityKindAt,
  type JobSpec,
} from './schema.js';
import { FileRefusal, formatBytes, readRegularFile } from './read-file.js';
import { parseSpectrumCsv, SPECTRUM_FILE_MAX_BYTES } from './spectrum-file.js';
import { closest } from './suggest.js';
import { elementOf } from '../elements/registry.js';
import type { ElementKind, ElementSchema, ElementSpec } from '../elements/types.js';
import { formatLength, isBareNumber } from './units.js';
import { escapeControl, safeEcho } from '../safe-text.js';

/**
 * Largest job file read: 256 KiB, some fifty times the largest job we know of (sweeps are written
 * as ranges, not as lists of thousands of values). The YAML parser is linear but not light: a MiB
 * of dense block YAML ('- {a: 1}' lines) took 6.5–8.7 s and 330–800 MB on the development machine,
 * so 256 KiB bounds the worst file at about two seconds and 200 MB.
 */
export const MAX_JOB_BYTES = 256 * 1024;
/** Problems described in one refusal; the rest are counted ("and 37 more problems"). */
export const MAX_PROBLEMS = 20;
/** Longest echo of a key in a message. */
const KEY_ECHO = 60;

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

/** "file:line:column: key.path: message"; the file name is escaped too (it came from input). */
export function formatProblem(file: string, p: JobProblem): string {
  const f = safeEcho(file, 300);
  const where = p.line !== undefined ? `${f}:${p.line}:${p.column ?? 1}` : f;
  return p.path ? `${where}: ${p.path}: ${p.message}` : `${where}: ${p.message}`;
}

/** A load warning as a line: "file:line:column: key.path: warning: message". */
export function formatWarning(file: string, p: JobProblem): string {
  return formatProblem(file, { ...p, message: `warning: ${p.message}` });
}

export interface LoadedJob {
  file: string;
  spec: JobSpec;
  /** The job exactly as written (parsed, before units and defaults), echoed into results. */
  given: Record<string, unknown>;
  /**
   * What loads but is probably not what was meant (a number without a unit, a wavelength outside
   * 100 nm – 20 µm), at most MAX_PROBLEMS, each with its key and position. Print with formatWarning.
   */
  warnings: JobProblem[];
}

/**
 * Reads, parses and validates a job file, then reads the files its element names (images),
 * relative to the job file's folder: parseJobText and validateJob read nothing, so a job whose
 * element names files loads only through here.
 */
export async function loadJobFile(file: string): Promise<LoadedJob> {
  const { loaded, positions } = parseWithPositions(await readJobText(file), file);
  await readElementFiles(loaded, dirname(file), positions);
  await readSpectrumFile(loaded, dirname(file), positions);
  return loaded;
}

/**
 * The files the job's element names (src/elements/types.ts ElementFiles): each read like the job
 * file (never blocking, special files refused, capped), all at once, then handed to the element,
 * which decodes and checks them. Every problem names the key, its line and column, and the file.
 */
async function readElementFiles(loaded: LoadedJob, folder: string, positions: Positions): Promise<void> {
  const element = elementOf(loaded.spec.aperture) as unknown as ElementKind<ElementSpec, ElementSchema, Record<string, unknown>>;
  if (!element.files) return;
  const job = loaded.spec.aperture as unknown as Record<string, unknown>;
  const problems = new Problems();
  const problem = (key: string | (string | number)[], message: string) => {
    const path = ['aperture', ...(Array.isArray(key) ? key : [key])];
    problems.add({ path: dotted(path), message, ...positionOf(path, positions, false) });
  };
  const named = element.files.named(job);
  const bytes = new Map<string, Buffer>();
  await Promise.all(
    named.map(async (f) => {
      const full = resolvePath(folder, f.path);
      try {
        bytes.set(f.key, await readRegularFile(full, f.limits));
      } catch (e) {
        if (!(e instanceof FileRefusal)) throw e;
        const where = full === f.path ? '' : ` (${safeEcho(full, 300)})`;
        problem(f.key, `cannot read '${safeEcho(f.path, 120)}'${where}: ${e.reason}`);
      }
    }),
  );
  if (problems.count === 0) {
    const attached = element.files.attach(job, bytes, problem);
    if (problems.count === 0) loaded.spec.aperture = attached as unknown as JobSpec['aperture'];
  }
  if (problems.count > 0) throw new JobError(loaded.file, problems.list());
}

/** The spectrum's CSV file (spectrum.file), read like the job file and attached as its table. */
async function readSpectrumFile(loaded: LoadedJob, folder: string, positions: Positions): Promise<void> {
  const s = loaded.spec.spectrum;
  if (!s?.file) return;
  const path = ['spectrum', 'file'];
  const full = resolvePath(folder, s.file);
  const fail = (message: string) => {
    throw new JobError(loaded.file, [{ path: dotted(path), message, ...positionOf(path, positions, false) }]);
  };
  let text: string;
  try {
    text = (await readRegularFile(full, { maxBytes: SPECTRUM_FILE_MAX_BYTES, noun: 'a spectrum file' })).toString('utf8');
  } catch (e) {
    if (!(e instanceof FileRefusal)) throw e;
    return fail(`cannot read '${safeEcho(s.file, 120)}'${full === s.file ? '' : ` (${safeEcho(full, 300)})`}: ${e.reason}`);
  }
  const table = parseSpectrumCsv(text);
  if ('problem' in table) return fail(`${safeEcho(s.file, 120)}: ${table.problem}`);
  s.table = table;
}

/** The file's text, or a JobError: never blocks, never reads more than MAX_JOB_BYTES + 1 bytes. */
async function readJobText(file: string): Promise<string> {
  try {
    return (await readRegularFile(file, { maxBytes: MAX_JOB_BYTES, noun: 'a job file' })).toString('utf8');
  } catch (e) {
    if (e instanceof FileRefusal) throw new JobError(file, [{ path: '', message: `cannot read the job file: ${e.reason}` }]);
    throw e;
  }
}

/** Parses job text (YAML, or JSON, which YAML reads too) and validates it. Reads no other file. */
export function parseJobText(text: string, file = '<job>'): LoadedJob {
  return parseWithPositions(text, file).loaded;
}

function parseWithPositions(text: string, file: string): { loaded: LoadedJob; positions: Positions } {
  if (text.length > MAX_JOB_BYTES) {
    throw new JobError(file, [{ path: '', message: `the job text is ${text.length} characters, more than the ${MAX_JOB_BYTES} (${formatBytes(MAX_JOB_BYTES)}) a job may hold` }]);
  }
  const lineCounter = new LineCounter();
  // uniqueKeys: false, and duplicates found below: the parser's own check compares every key of a
  // mapping with every other (100 000 keys took two minutes).
  const doc = parseDocument(text, { lineCounter, prettyErrors: true, uniqueKeys: false });
  const syntax = new Problems();
  for (const err of doc.errors) {
    const pos = err.linePos?.[0];
    syntax.add({
      path: '',
      // The parser's first line repeats the position ("... at line 3, column 1:"), given in front.
      message: `syntax error: ${safeEcho(err.message.split('\n')[0]!.replace(/ at line \d+, column \d+:?\s*$/, ''))}`,
      line: pos?.line,
      column: pos?.col,
    });
  }
  if (doc.errors.length === 0) findDuplicateKeys(doc, lineCounter, syntax);
  if (syntax.count > 0) throw new JobError(file, syntax.list());
  let given: unknown;
  try {
    given = doc.toJS(); // refuses alias bombs itself (more than 100 alias expansions)
  } catch (e) {
    throw new JobError(file, [{ path: '', message: `cannot read the document: ${safeEcho((e as Error).message)}` }]);
  }
  if (given === null || typeof given !== 'object' || Array.isArray(given)) {
    throw new JobError(file, [
      { path: '', message: 'expected a job: a mapping of keys such as name, wavelength, distance, aperture' },
    ]);
  }
  const positions = { doc, lineCounter };
  return { loaded: validateJob(given as Record<string, unknown>, file, positions), positions };
}

/**
 * Keys repeated in one mapping, at the later occurrence, in one pass with a set per mapping.
 * Keys compare as the object keys they become ('1' and 1 are the same key), and the walk keeps its
 * own stack, so deep nesting cannot overflow the call stack.
 */
function findDuplicateKeys(doc: Document, lineCounter: LineCounter, out: Problems): void {
  const stack: unknown[] = [doc.contents];
  while (stack.length > 0 && !out.full) {
    const node = stack.pop();
    if (isMap(node)) {
      const seen = new Set<string>();
      for (const item of node.items) {
        const k = item.key;
        if (isScalar(k)) {
          const id = String(k.value);
          if (seen.has(id)) {
            const offset = k.range?.[0] ?? 0;
            const { line, col } = lineCounter.linePos(offset);
            out.add({ path: '', message: 'syntax error: Map keys must be unique', line, column: col });
          }
          seen.add(id);
        }
        if (isNode(item.value)) stack.push(item.value);
      }
    } else if (isSeq(node)) {
      for (const item of node.items) if (isNode(item)) stack.push(item);
    }
  }
}

/**
 * A capped list of problems: the first MAX_PROBLEMS (without repeats) are kept, the rest counted.
 */
class Problems {
  private readonly items: { p: JobProblem; order: number }[] = [];
  private readonly seen = new Set<string>();
  private more = 0;

  get full(): boolean {
    return this.items.length >= MAX_PROBLEMS;
  }
  get count(): number {
    return this.items.length + this.more;
  }
  /** Counts problems not described (the list is full). */
  skip(n = 1): void {
    this.more += n;
  }
  /** `order` sorts the list (default: by line and column; problems without a line last, as found). */
  add(p: JobProblem, order = p.line !== undefined ? p.line * 1e7 + (p.column ?? 0) : Number.MAX_SAFE_INTEGER): void {
    const key = `${p.path}|${p.message}|${p.line}|${p.column}`;
    if (this.seen.has(key)) return;
    if (this.full) {
      this.more++;
      return;
    }
    this.seen.add(key);
    this.items.push({ p, order });
  }
  private withCount(list: JobProblem[]): JobProblem[] {
    if (this.more === 0) return list;
    return [...list, { path: '', message: `and ${this.more} more problem${this.more === 1 ? '' : 's'} (the first ${MAX_PROBLEMS} are listed)` }];
  }
  /** In the order of the text (a stable sort: problems at one place keep the order found). */
  list(): JobProblem[] {
    return this.withCount([...this.items].sort((a, b) => a.order - b.order).map((i) => i.p));
  }
}

interface Positions {
  doc: Document;
  lineCounter: LineCounter;
}

/** Validates an already-parsed job object (the library entry point for scripted jobs). */
export function validateJob(given: Record<string, unknown>, file = '<job>', positions?: Positions): LoadedJob {
  const result = jobSchema.safeParse(given);
  if (result.success) return { file, spec: result.data, given, warnings: loadWarnings(result.data, given, positions) };
  const problems = new Problems();
  for (const issue of flattenIssues(result.error.issues)) {
    if (problems.full) {
      // Described no further (each description may search for a suggestion): only counted.
      problems.skip(issue.code === 'unrecognized_keys' ? issue.keys.length : 1);
      continue;
    }
    describeIssue(issue, given, positions, problems);
  }
  throw new JobError(file, problems.list());
}

function flattenIssues(issues: readonly $ZodIssue[]): $ZodIssue[] {
  const out: $ZodIssue[] = [];
  for (const issue of issues) {
    // A union reports every branch's failure; the most specific branch is the one whose issues
    // reach deepest, which is what a person meant to write.
    if (issue.code === 'invalid_union' && issue.errors.length > 0) {
      // (Depths are within the branch: its issues' paths are relative to the union's.)
      let best = issue.errors[0]!;
      for (const branch of issue.errors) if (depth(branch) > depth(best)) best = branch;
      if (depth(best) > 0) {
        out.push(...flattenIssues(best.map((b) => ({ ...b, path: [...issue.path, ...b.path] }) as $ZodIssue)));
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

/** How deep a branch's issues reach (a loop: a branch may hold 100 000 issues, too many to spread). */
function depth(branch: $ZodIssue[]): number {
  let d = -Infinity;
  for (const i of branch) d = Math.max(d, i.path.length + (i.code === 'custom' ? 0.5 : 0));
  return d;
}

function describeIssue(issue: $ZodIssue, given: unknown, positions: Positions | undefined, out: Problems): void {
  const path = issue.path.map((p) => (typeof p === 'number' ? p : String(p)));
  if (issue.code === 'unrecognized_keys') {
    // One problem per key, at the key's own line; suggestions for the first MAX_PROBLEMS only.
    const known = knownKeysAt(path, given);
    for (const k of issue.keys) {
      if (out.full) {
        out.skip();
        continue;
      }
      const hint = closest(k, known);
      out.add({
        path: dotted(path),
        message: `unknown key '${safeEcho(k, KEY_ECHO)}'${hint ? ` (did you mean '${hint}'?)` : ''}; known keys here: ${known.join(', ')}`,
        ...positionOf([...path, k], positions, true),
      });
    }
    return;
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
  out.add({ path: dotted(path), message: `${message}${got}${reason ? `: ${reason}` : ''}`, ...positionOf(path, positions, false) });
}

/**
 * Warnings for a job that loads: a number without a unit where a length or an angle goes (once
 * per key, at its first such value), and wavelengths outside 100 nm – 20 µm.
 */
function loadWarnings(spec: JobSpec, given: Record<string, unknown>, positions?: Positions): JobProblem[] {
  const out = new Problems();
  const warned = new Set<string>();
  // The job is valid here, so its depth and size are the schema's (lists of at most 100 000 values).
  const walk = (v: unknown, path: (string | number)[]): void => {
    if (Array.isArray(v)) {
      v.forEach((x, i) => walk(x, [...path, i]));
    } else if (v !== null && typeof v === 'object') {
      for (const [k, x] of Object.entries(v)) walk(x, [...path, k]);
    } else if (isBareNumber(v) && Number(v) !== 0) {
      const kind = quantityKindAt(path);
      if (!kind) return;
      const key = path.filter((p) => typeof p === 'string').join('.');
      if (warned.has(key)) return;
      warned.add(key);
      const text = safeEcho(typeof v === 'string' ? v.trim() : String(v));
      const x = Number(v);
      const unit = kind === 'length' ? 'm' : 'rad';
      const said = kind === 'length' ? formatLength(x) : `${Number(((x * 180) / Math.PI).toPrecision(4))}°`;
      out.add({
        path: dotted(path),
        message: `taken as ${text} ${unit}${said === `${text} ${unit}` ? '' : ` (${said})`}, as a number without a unit is in ${kind === 'length' ? 'metres' : 'radians'}; write '${text} ${unit}' to silence this`,
        ...positionOf(path, positions, false),
      });
    }
  };
  walk(given, []);
  const unusual = (spec.wavelength?.values ?? []).filter((w) => w < WAVELENGTH_USUAL_MIN || w > WAVELENGTH_USUAL_MAX);
  if (unusual.length > 0) {
    const which = unusual.length === 1 ? formatLength(unusual[0]!) : `${unusual.length} of the wavelengths (${formatLength(unusual[0]!)}, ...)`;
    out.add({
      path: 'wavelength',
      message: `${which} outside ${formatLength(WAVELENGTH_USUAL_MIN)} – ${formatLength(WAVELENGTH_USUAL_MAX)}, the ultraviolet to the mid-infrared: computed as given, but check the unit`,
      ...positionOf(['wavelength'], positions, false),
    });
  }
  return out.list();
}

function knownKeysAt(path: (string | number)[], given: unknown): string[] {
  const key = path.filter((p) => typeof p === 'string').join('.');
  const here = valueAt(given, path) as Record<string, unknown> | undefined;
  switch (key) {
    case '':
      return JOB_KEYS;
    case 'aperture':
    case 'planes.element': {
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
    case 'search.pinhole':
      return PINHOLE_SEARCH_KEYS;
    case 'planes':
      return PLANE_KEYS;
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
  return path.map((p, i) => (typeof p === 'number' ? `[${p}]` : i === 0 ? safeEcho(p, KEY_ECHO) : `.${safeEcho(p, KEY_ECHO)}`)).join('');
}

/** A value as echoed after "got": text quoted and cut, anything else as short JSON, escaped. */
function show(v: unknown): string {
  if (typeof v === 'string') return `'${safeEcho(v, 80)}'`;
  const s = preview(v, 100);
  return escapeControl(s.length > 80 ? `${s.slice(0, 77)}...` : s);
}

/**
 * JSON of a value, stopped once about `budget` characters are written: a list of a million values
 * or a deeply nested one costs no more than a short one.
 */
function preview(v: unknown, budget: number): string {
  const parts: string[] = [];
  let used = 0;
  const put = (s: string) => {
    parts.push(s);
    used += s.length;
  };
  const go = (x: unknown): void => {
    if (used > budget) return;
    if (Array.isArray(x)) {
      put('[');
      for (let i = 0; i < x.length; i++) {
        if (used > budget) break;
        if (i > 0) put(',');
        go(x[i]);
      }
      put(']');
    } else if (x !== null && typeof x === 'object') {
      put('{');
      let first = true;
      for (const k in x) {
        if (used > budget) break;
        if (!first) put(',');
        first = false;
        put(`${JSON.stringify(k.length > budget ? k.slice(0, budget) : k)}:`);
        go((x as Record<string, unknown>)[k]);
      }
      put('}');
    } else if (typeof x === 'string') {
      put(JSON.stringify(x.length > budget ? x.slice(0, budget) : x));
    } else {
      put(JSON.stringify(x) ?? String(x));
    }
  };
  go(v);
  return parts.join('');
}
