/**
 * The validation tier of the three error tiers (style.md habit 6): user and file input that fails its
 * schema. One error class, carrying every issue with its path in the user's field names, and one
 * formatter, `path: message`, used by the command line, the web app and the science core alike.
 *
 * `ValidationError` is the only error the command line reports as bad input (exit 2); any other error
 * is a bug or an environment failure (exit 1).
 */
import type { z } from 'zod';

/** One problem with an input: where (path of field names and array indices) and what. */
export interface ValidationIssue {
  path: readonly PropertyKey[];
  message: string;
}

/** `a.b.0.c`, or `root` (default `(root)`) for an empty path. */
export function formatIssuePath(path: readonly PropertyKey[], root = '(root)'): string {
  return path.length > 0 ? path.map(String).join('.') : root;
}

/**
 * The one `path: message` formatter. `prefix` is prepended to the path (`features.3` gives
 * `features.3.geometry: ...`); `root` names an empty path.
 */
export function formatIssue(
  issue: ValidationIssue,
  options: { prefix?: string; root?: string } = {},
): string {
  const { prefix, root } = options;
  const path = issue.path.length > 0 ? formatIssuePath(issue.path) : undefined;
  const where = prefix ? (path ? `${prefix}.${path}` : prefix) : (path ?? root ?? '(root)');
  return `${where}: ${issue.message}`;
}

/** Every issue of a zod error as `path: message` lines. */
export function formatZodIssues(
  error: Pick<z.ZodError, 'issues'>,
  options: { prefix?: string; root?: string } = {},
): string[] {
  return error.issues.map((issue) => formatIssue(issue, options));
}

/** Characters of the one-line summary (issue 21: at most 300 on a line). */
export const SUMMARY_MAX_CHARS = 300;

/** Collapse control characters (newlines, tabs, escapes) so a message stays on one line. */
export function oneLine(text: string): string {
  // eslint-disable-next-line no-control-regex
  return text.replace(/[\u0000-\u001f\u007f]+/g, ' ').trim();
}

/** `text` cut to `max` characters with an ellipsis. */
export function clip(text: string, max: number): string {
  return text.length <= max ? text : `${text.slice(0, Math.max(0, max - 1))}…`;
}

/**
 * Input that fails validation. `source` names the file, form or option (`pile-atlas-inputs.json`,
 * `--out`); `issues` lists every problem. `message` is the one-line summary: the first issue and how
 * many more there are.
 */
export class ValidationError extends Error {
  readonly source: string;
  readonly issues: readonly ValidationIssue[];

  constructor(source: string, issues: readonly ValidationIssue[] | string) {
    const list: ValidationIssue[] =
      typeof issues === 'string' ? [{ path: [], message: issues }] : [...issues];
    if (list.length === 0) list.push({ path: [], message: 'invalid' });
    super(ValidationError.summarise(source, list, Infinity));
    this.name = 'ValidationError';
    this.source = source;
    this.issues = list;
  }

  /** A ValidationError from a zod error, paths in the user's field names. */
  static fromZod(source: string, error: Pick<z.ZodError, 'issues'>): ValidationError {
    return new ValidationError(source, error.issues);
  }

  /** One line: `source: path: message` for each issue (issue lines of `source` alone when path-less). */
  lines(): string[] {
    return this.issues.map((issue) => ValidationError.line(this.source, issue));
  }

  /**
   * The first issue on one line of at most `maxChars` characters, with the count of further issues
   * (`… (+12 more issues)`); `hint` is appended to that count (e.g. `--verbose lists all`).
   */
  summary(maxChars = SUMMARY_MAX_CHARS, hint = ''): string {
    return ValidationError.summarise(this.source, this.issues, maxChars, hint);
  }

  private static line(source: string, issue: ValidationIssue): string {
    const body = issue.path.length > 0 ? formatIssue(issue) : issue.message;
    return oneLine(source ? `${source}: ${body}` : body);
  }

  private static summarise(
    source: string,
    issues: readonly ValidationIssue[],
    maxChars: number,
    hint = '',
  ): string {
    const more = issues.length - 1;
    const tail = more > 0 ? ` (+${more} more issue${more === 1 ? '' : 's'}${hint ? `; ${hint}` : ''})` : '';
    return clip(ValidationError.line(source, issues[0]), maxChars - tail.length) + tail;
  }
}
