// Text from a job file or a command line, made safe to echo: a job file must not be able to
// rewrite the user's terminal (escape sequences, BEL, NUL), flood it (a 100 kB name), or run a
// formula in the spreadsheet that opens summary.csv. Every place that echoes a value from input
// goes through these (console, result.json, report.html, summary.csv).

/** Longest echo of one input value, in characters; longer values are cut and their length given. */
export const ECHO_MAX = 200;

/**
 * Control characters (C0, DEL, C1) and the Unicode line/paragraph separators and bidi controls
 * as visible escapes (\x1b, \u202e); everything else unchanged. Tabs and newlines are escaped too:
 * an echoed value stays on its line.
 */
export function escapeControl(text: string): string {
  return text.replace(/[\u0000-\u001f\u007f-\u009f\u2028\u2029\u200e\u200f\u202a-\u202e\u2066-\u2069]/g, (ch) => {
    const code = ch.charCodeAt(0);
    return code <= 0xff ? `\\x${code.toString(16).padStart(2, '0')}` : `\\u${code.toString(16).padStart(4, '0')}`;
  });
}

/**
 * A value from input as it may be echoed: control characters escaped, and cut to about `max`
 * characters with the full length said ("…(100000 characters)"). Cut before escaping, so the
 * result's length is bounded whatever the input; a surrogate pair is never split.
 */
export function safeEcho(value: unknown, max: number = ECHO_MAX): string {
  const text = typeof value === 'string' ? value : String(value);
  if (text.length <= max) return escapeControl(text);
  let cut = max;
  const code = text.charCodeAt(cut - 1);
  if (code >= 0xd800 && code <= 0xdbff) cut--;
  return `${escapeControl(text.slice(0, cut))}…(${text.length} characters)`;
}

/**
 * Text of one or more lines that may quote input (a message, a plan): the line breaks (LF or CRLF)
 * kept, each line as safeEcho shows it cut at lineChars, at most maxLines lines and the rest
 * counted ("…(12 more lines)").
 */
export function safeLines(text: string, maxLines: number, lineChars: number): string {
  const all = text.split(/\r\n|\n/);
  const shown = all.slice(0, maxLines).map((l) => safeEcho(l, lineChars));
  if (all.length > maxLines) shown.push(`…(${all.length - maxLines} more lines)`);
  return shown.join('\n');
}

/**
 * A CSV cell that a spreadsheet would take for a formula (it starts with = + - @, or a tab or
 * carriage return before one) gets a leading apostrophe, the common-practice guard against formula
 * injection. Numbers are never passed here: only text from input (names, shapes, paths).
 */
export function guardFormula(cell: string): string {
  return /^[=+\-@\t\r]/.test(cell) ? `'${cell}` : cell;
}

const HTML_ESCAPES: Record<string, string> = { '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' };

/** Escapes text for HTML element content and for quoted attribute values alike. */
export function escapeHtml(s: string): string {
  return s.replace(/[&<>"']/g, (ch) => HTML_ESCAPES[ch]!);
}
