/**
 * The command line's messages (issue 21 item 4, issue 16 item 5): the one `path: message` formatter,
 * the ValidationError summary (one line of at most 300 characters with the count of further issues),
 * JSON syntax errors on one line with their line and column, and the exit tiers: 2 only for a
 * ValidationError, 1 with one short line for anything else (a TypeError is a bug, not bad input).
 */
import { afterEach, describe, expect, it, vi } from 'vitest';
import { z } from 'zod';
import { reportError } from '../../data-pipeline/cli';
import { InputError } from '../../data-pipeline/input-error';
import {
  describeJsonSyntaxError,
  jsonErrorOffset,
  lineColumnAt,
  parseJsonText,
} from '../../data-pipeline/read/read-json-file';
import {
  formatIssue,
  formatIssuePath,
  formatZodIssues,
  oneLine,
  ValidationError,
} from '../../layers/validation-error';

function captureStderr(): { text: () => string } {
  let text = '';
  vi.spyOn(process.stderr, 'write').mockImplementation((chunk: string | Uint8Array) => {
    text += String(chunk);
    return true;
  });
  return { text: () => text };
}

afterEach(() => vi.restoreAllMocks());

describe('the path: message formatter', () => {
  it('joins paths with dots, names an empty path, takes a prefix', () => {
    expect(formatIssuePath(['grids', 3, 'unit'])).toBe('grids.3.unit');
    expect(formatIssuePath([])).toBe('(root)');
    expect(formatIssue({ path: ['a', 0], message: 'bad' })).toBe('a.0: bad');
    expect(formatIssue({ path: [], message: 'bad' }, { root: '(url)' })).toBe('(url): bad');
    expect(formatIssue({ path: ['geometry'], message: 'bad' }, { prefix: 'features.2' })).toBe(
      'features.2.geometry: bad',
    );
    expect(formatIssue({ path: [], message: 'bad' }, { prefix: 'features.2' })).toBe('features.2: bad');
  });

  it('formats every zod issue with its path in the schema field names', () => {
    const schema = z.strictObject({ pile: z.strictObject({ length_m: z.number().max(60) }) });
    const r = schema.safeParse({ pile: { length_m: 80, lenght_m: 1 } });
    expect(r.success).toBe(false);
    const lines = formatZodIssues(r.error!);
    expect(lines).toHaveLength(2);
    expect(lines.some((l) => l.startsWith('pile.length_m: '))).toBe(true);
    expect(lines.some((l) => l.startsWith('pile: ') && l.includes('lenght_m'))).toBe(true);
  });
});

describe('ValidationError', () => {
  it('summarises 10,000 issues on one line of at most 300 characters with the count of the rest', () => {
    const issues = Array.from({ length: 10_000 }, (_, i) => ({
      path: ['grids', i, 'role'],
      message: `Invalid option: expected one of ${'x'.repeat(400)}`,
    }));
    const err = new ValidationError('pile-atlas-inputs.json', issues);
    const line = err.summary(300, '--verbose lists all');
    expect(line.length).toBeLessThanOrEqual(300);
    expect(line).not.toContain('\n');
    expect(line).toMatch(/^pile-atlas-inputs\.json: grids\.0\.role: Invalid option/);
    expect(line).toMatch(/… \(\+9999 more issues; --verbose lists all\)$/);
    expect(err.lines()).toHaveLength(10_000);
    expect(err.lines()[9999]).toMatch(/^pile-atlas-inputs\.json: grids\.9999\.role: /);
  });

  it('keeps newlines and control characters out of its lines', () => {
    const err = new ValidationError('a.json', [{ path: ['x'], message: 'line one\nline two\r\u001b[31m' }]);
    expect(err.message).toBe('a.json: x: line one line two [31m');
    expect(oneLine('a\n\n\tb')).toBe('a b');
  });

  it('InputError is a ValidationError whose message names the file itself', () => {
    const err = new InputError('soil.tif: not a TIFF file');
    expect(err).toBeInstanceOf(ValidationError);
    expect(err.message).toBe('soil.tif: not a TIFF file');
  });
});

describe('JSON syntax errors on one line with line and column', () => {
  // V8 echoes the offending text in some messages ("Unexpected token 'o', "{\n  "a": oops\n}" is not
  // valid JSON"): a multi-line file made a multi-line message before.
  const cases: [string, string, RegExp][] = [
    [
      'an unexpected token on line 3',
      '{\n  "a": 1,\n  "b": oops\n}\n',
      /Unexpected token 'o' at line 3, column 8/,
    ],
    ['a trailing comma', '{\n "a": 1,\n}', /line 3, column 1/],
    ['an unterminated string', '{"a": "x', /Unterminated string at line 1, column 9/],
    ['an empty file', '', /Unexpected end of JSON input at line 1, column 1/],
    [
      'garbage after the value',
      '{"a":1}\nxyz',
      /Unexpected non-whitespace character after JSON at line 2, column 1/,
    ],
    ['a CSV file', 'name,lon,lat\nNorth,1,75\n', /Unexpected token 'a' at line 1, column 2/],
  ];
  for (const [name, text, expected] of cases) {
    it(name, () => {
      let err: unknown;
      try {
        parseJsonText('x.json', text);
      } catch (e) {
        err = e;
      }
      expect(err).toBeInstanceOf(InputError);
      const message = (err as Error).message;
      expect(message).not.toContain('\n');
      expect(message).toMatch(/^x\.json: not valid JSON \(/);
      expect(message).toMatch(expected);
    });
  }

  it('finds the offending character by bisection (hand-counted offsets)', () => {
    expect(jsonErrorOffset('{"a": oops}')).toBe(6); // the o of oops
    expect(jsonErrorOffset('[1, 2, x]')).toBe(7);
    expect(lineColumnAt('ab\ncd\nef', 7)).toEqual({ line: 3, column: 2 });
    expect(
      describeJsonSyntaxError(
        '[1 2]',
        new SyntaxError("Expected ',' or ']' after array element in JSON at position 3"),
      ),
    ).toBe("Expected ',' or ']' after array element at line 1, column 4");
  });
});

describe('exit tiers', () => {
  it('a ValidationError: exit 2, one line with the count and the --verbose hint', () => {
    const err = captureStderr();
    const issues = Array.from({ length: 50 }, (_, i) => ({ path: ['grids', i], message: 'bad' }));
    expect(reportError('build', new ValidationError('c.json', issues), false)).toBe(2);
    expect(err.text()).toBe(
      'pile-atlas build: error: c.json: grids.0: bad (+49 more issues; --verbose lists all)\n',
    );
  });

  it('a ValidationError with --verbose: every issue, one per line', () => {
    const err = captureStderr();
    const issues = Array.from({ length: 50 }, (_, i) => ({ path: ['grids', i], message: 'bad' }));
    expect(reportError('build', new ValidationError('c.json', issues), true)).toBe(2);
    const lines = err.text().trimEnd().split('\n');
    expect(lines).toHaveLength(50);
    expect(lines[49]).toBe('pile-atlas build: error: c.json: grids.49: bad');
  });

  it('a TypeError (a bug): exit 1, one short line naming it and where it was thrown, no stack', () => {
    const err = captureStderr();
    let bug: unknown;
    try {
      void (undefined as unknown as { x: number }).x;
    } catch (e) {
      bug = e;
    }
    expect(reportError('build', bug, false)).toBe(1);
    const lines = err.text().trimEnd().split('\n');
    expect(lines).toHaveLength(1);
    expect(lines[0].length).toBeLessThanOrEqual(300);
    expect(lines[0]).toMatch(
      /^pile-atlas build: internal error \(a bug or a system failure, not bad input\): TypeError: /,
    );
    expect(lines[0]).toMatch(/at tests\/unit\/cli-messages\.test\.ts:\d+; --verbose for the stack$/);
  });

  it('a RangeError from a model (a schema and model that disagree) is exit 1 too', () => {
    captureStderr();
    expect(reportError('site', new RangeError('radius_m must be in [0.05, 1] m, got 7'), false)).toBe(1);
  });

  it('an internal error with --verbose adds the stack', () => {
    const err = captureStderr();
    expect(reportError('build', new Error('boom'), true)).toBe(1);
    expect(err.text().split('\n').length).toBeGreaterThan(3);
  });
});
