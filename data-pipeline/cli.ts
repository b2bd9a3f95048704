/**
 * The `pile-atlas` command line: a small command table, one module per command in commands/.
 * JSON goes to stdout, progress and warnings to stderr. Exit codes: 0 success; 2 bad input, and only
 * for a ValidationError (layers/validation-error.ts; InputError is one): one line of at most 300
 * characters naming the file or field, the count of further issues, no stack trace (`--verbose`: every
 * issue, one per line); 1 anything else, a bug or an environment failure: one short line naming the
 * error and where it was thrown (`--verbose`: the stack). SIGINT/SIGTERM/SIGHUP remove the output
 * being written and roll back a swap in progress before exiting with 128 + the signal number.
 */
import { relative, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { clip, oneLine, SUMMARY_MAX_CHARS, ValidationError } from '../layers/validation-error';
import { abortActiveOutputs } from './build/atomic-output';
import { buildCommand } from './commands/build';
import { cellCommand } from './commands/cell';
import type { Command } from './commands/command';
import { demoDataCommand } from './commands/demo-data';
import { siteCommand } from './commands/site';
import { shortlistCommand } from './commands/shortlist';
import { workerCommand } from './commands/worker';

export const COMMANDS: Command[] = [
  demoDataCommand,
  buildCommand,
  cellCommand,
  siteCommand,
  shortlistCommand,
  workerCommand,
];

export const EXIT_OK = 0;
export const EXIT_INTERNAL = 1;
export const EXIT_BAD_INPUT = 2;

function topLevelHelp(): string {
  const width = Math.max(...COMMANDS.map((c) => c.name.length));
  return [
    'pile-atlas <command> [options]',
    '',
    'Regional screening of permafrost terrain for foundation-pile ground heat exchangers.',
    'Screening estimates, not a design.',
    '',
    'Commands:',
    ...COMMANDS.map((c) => `  ${c.name.padEnd(width)}  ${c.summary}`),
    '',
    "Run `pile-atlas <command> --help` for a command's options. Any command takes --verbose: every issue",
    'of a bad input, one per line, and the stack of an internal error.',
    'Exit codes: 0 success, 2 bad input (one line naming the file and field), 1 internal error.',
  ].join('\n');
}

const REPO_ROOT = resolve(fileURLToPath(new URL('.', import.meta.url)), '..');

/** `file:line` of the innermost stack frame in the project's own code (not node_modules), or ''. */
function whereThrown(err: Error): string {
  for (const line of (err.stack ?? '').split('\n').slice(1)) {
    const m = /\(?((?:file:\/\/)?\/[^():]+):(\d+):\d+\)?\s*$/.exec(line);
    if (!m || m[1].includes('node_modules') || m[1].startsWith('node:')) continue;
    const file = m[1].startsWith('file://') ? fileURLToPath(m[1]) : m[1];
    return `${relative(REPO_ROOT, file)}:${m[2]}`;
  }
  return '';
}

/**
 * Report a failed command on stderr and return its exit code: 2 with one line (or, verbose, one line
 * per issue) for a ValidationError; 1 with one short line (verbose: the stack) for anything else.
 */
export function reportError(command: string, err: unknown, verbose: boolean): number {
  const prefix = `pile-atlas ${command}: error: `;
  if (err instanceof ValidationError) {
    const lines = verbose
      ? err.lines()
      : [err.summary(SUMMARY_MAX_CHARS - prefix.length, '--verbose lists all')];
    process.stderr.write(lines.map((l) => `${prefix}${l}\n`).join(''));
    return EXIT_BAD_INPUT;
  }
  const e = err instanceof Error ? err : new Error(String(err));
  const where = whereThrown(e);
  const head = `pile-atlas ${command}: internal error (a bug or a system failure, not bad input): `;
  const tail = `${where ? ` at ${where}` : ''}${verbose ? '' : '; --verbose for the stack'}`;
  const what = clip(
    oneLine(`${e.name}: ${e.message}`),
    Math.max(40, SUMMARY_MAX_CHARS - head.length - tail.length),
  );
  process.stderr.write(`${head}${what}${tail}\n`);
  if (verbose && e.stack) process.stderr.write(`${e.stack}\n`);
  return EXIT_INTERNAL;
}

/** Run the CLI with `argv` (without node and script); resolves to the exit code. */
export async function main(argvIn: string[]): Promise<number> {
  const verbose = argvIn.includes('--verbose');
  const argv = argvIn.filter((a) => a !== '--verbose');
  const [name, ...rest] = argv;
  if (!name || name === '--help' || name === '-h' || name === 'help') {
    process.stdout.write(topLevelHelp() + '\n');
    return name ? EXIT_OK : EXIT_BAD_INPUT;
  }
  const command = COMMANDS.find((c) => c.name === name);
  if (!command) {
    process.stderr.write(
      `pile-atlas: unknown command "${name}" (commands: ${COMMANDS.map((c) => c.name).join(', ')})\n`,
    );
    return EXIT_BAD_INPUT;
  }
  if (rest.includes('--help') || rest.includes('-h')) {
    process.stdout.write(command.help + '\n');
    return EXIT_OK;
  }
  try {
    return await command.run(rest);
  } catch (err) {
    return reportError(name, err, verbose);
  }
}

const SIGNALS = { SIGHUP: 1, SIGINT: 2, SIGTERM: 15 } as const;

/**
 * Run the CLI as this process (the `pile-atlas` bin and `tsx data-pipeline/cli.ts`): signal handlers
 * that undo a build's output in progress, EPIPE on stdout treated as success, the exit code set.
 */
export function runCliProcess(argv: string[]): void {
  // A reader that stops early (`| head`) closes the pipe: that is not an error of ours.
  process.stdout.on('error', (err: NodeJS.ErrnoException) => {
    if (err.code === 'EPIPE') process.exit(EXIT_OK);
    throw err;
  });
  for (const [signal, number] of Object.entries(SIGNALS)) {
    process.once(signal, () => {
      abortActiveOutputs();
      process.stderr.write(`pile-atlas: stopped by ${signal}; the previous output is untouched\n`);
      process.exit(128 + number);
    });
  }
  // Under `npm run`, a wrapper killed outright (SIGKILL) cannot forward anything; this process then
  // finds itself re-parented and stops like on SIGHUP instead of finishing the build as an orphan.
  if (process.env.npm_lifecycle_event !== undefined) {
    const parent = process.ppid;
    setInterval(() => {
      if (process.ppid === parent) return;
      abortActiveOutputs();
      process.stderr.write(
        'pile-atlas: the npm wrapper is gone; stopped, the previous output is untouched\n',
      );
      process.exit(128 + SIGNALS.SIGHUP);
    }, 250).unref();
  }
  main(argv).then(
    (code) => {
      process.exitCode = code;
    },
    (err: unknown) => {
      process.exitCode = reportError(argv[0] ?? '', err, argv.includes('--verbose'));
    },
  );
}

const invokedDirectly = process.argv[1] !== undefined && /cli\.[cm]?[jt]s$/.test(process.argv[1]);
if (invokedDirectly) runCliProcess(process.argv.slice(2));
