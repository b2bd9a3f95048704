/**
 * JSON files as the pipeline reads them: a size limit before reading, the path as named in messages,
 * and a syntax error reported on one line (line and column, the reason without the echo of the file's
 * text that V8 puts into its message, which spans lines when the file does).
 */
import { readFile, stat } from 'node:fs/promises';
import { clip, oneLine } from '../../layers/validation-error';
import { InputError } from '../input-error';

/** Largest JSON file read by default (a config, a scenario, a site input, a GeoJSON layer), bytes. */
export const MAX_JSON_BYTES = 256 * 1024 * 1024;

/** Line and column (1-based) of character `position` in `text`. */
export function lineColumnAt(text: string, position: number): { line: number; column: number } {
  let line = 1;
  let lineStart = 0;
  const end = Math.min(position, text.length);
  for (let i = 0; i < end; i++) {
    if (text.charCodeAt(i) === 10) {
      line++;
      lineStart = i + 1;
    }
  }
  return { line, column: end - lineStart + 1 };
}

/** True when `prefix` is valid JSON or could become valid by appending characters. */
function viablePrefix(prefix: string): boolean {
  try {
    JSON.parse(prefix);
    return true;
  } catch (err) {
    const message = (err as Error).message;
    if (/Unexpected end of JSON input/.test(message)) return true;
    const at = /\bat position (\d+)/.exec(message);
    return at !== null && Number(at[1]) >= prefix.length;
  }
}

/**
 * Offset of the character where `text` stops being valid JSON (V8 names the token but not its
 * position for some errors): viable prefixes are closed under shortening, so a binary search over
 * the prefix length finds the first offending character in log2(n) parses.
 */
export function jsonErrorOffset(text: string): number {
  let lo = 0;
  let hi = text.length;
  while (lo < hi) {
    const mid = Math.ceil((lo + hi) / 2);
    if (viablePrefix(text.slice(0, mid))) lo = mid;
    else hi = mid - 1;
  }
  return lo;
}

/** The reason of a JSON.parse error in a few words, on one line, with its position if V8 gives one. */
export function describeJsonSyntaxError(text: string, err: unknown): string {
  const raw = err instanceof Error ? err.message : String(err);
  const at = /\bat position (\d+)/.exec(raw);
  let reason = raw.replace(/\s*(in JSON )?at position \d+.*$/s, '');
  const token = /^(Unexpected token '.*?'|Unexpected non-whitespace character after JSON),/s.exec(reason);
  if (token) reason = token[1];
  reason = clip(oneLine(reason), 80);
  const end = /Unexpected end of JSON input/.test(raw);
  const position = at ? Number(at[1]) : end ? text.length : jsonErrorOffset(text);
  const { line, column } = lineColumnAt(text, position);
  return `${reason} at line ${line}, column ${column}`;
}

/** Parse `text` as JSON; a syntax error is an InputError naming `label`, on one line. */
export function parseJsonText(label: string, text: string): unknown {
  try {
    return JSON.parse(text);
  } catch (err) {
    throw new InputError(`${label}: not valid JSON (${describeJsonSyntaxError(text, err)})`);
  }
}

function readError(label: string, err: unknown): InputError {
  const code = (err as NodeJS.ErrnoException).code;
  if (code === 'ENOENT') return new InputError(`${label}: file not found`);
  if (code === 'EISDIR') return new InputError(`${label}: is a directory, expected a JSON file`);
  return new InputError(`${label}: cannot read (${code ?? oneLine(String(err))})`);
}

/** Read and parse a JSON file of at most `maxBytes`; every failure an InputError naming `label`. */
export async function readJsonFile(path: string, label: string, maxBytes = MAX_JSON_BYTES): Promise<unknown> {
  let text: string;
  try {
    const st = await stat(path);
    if (st.isDirectory()) throw Object.assign(new Error('directory'), { code: 'EISDIR' });
    if (!st.isFile()) throw new InputError(`${label}: not a regular file (a device, FIFO or socket)`);
    if (st.size > maxBytes) {
      throw new InputError(
        `${label}: ${st.size} bytes, over the limit of ${maxBytes} bytes for a JSON input`,
      );
    }
    text = await readFile(path, 'utf8');
  } catch (err) {
    if (err instanceof InputError) throw err;
    throw readError(label, err);
  }
  return parseJsonText(label, text);
}
