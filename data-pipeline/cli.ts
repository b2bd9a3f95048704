/**
 * The `pile-atlas` command line: a small command table, one module per command in commands/.
 * JSON goes to stdout, progress and warnings to stderr. Exit codes: 0 success, 1 internal error,
 * 2 bad input (one-line message naming the file or field, no stack trace).
 */
import { buildCommand } from './commands/build';
import { cellCommand } from './commands/cell';
import type { Command } from './commands/command';
import { demoDataCommand } from './commands/demo-data';
import { siteCommand } from './commands/site';
import { shortlistCommand } from './commands/shortlist';
import { InputError } from './input-error';

export const COMMANDS: Command[] = [
  demoDataCommand,
  buildCommand,
  cellCommand,
  siteCommand,
  shortlistCommand,
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
    "Run `pile-atlas <command> --help` for a command's options.",
  ].join('\n');
}

/** Run the CLI with `argv` (without node and script); resolves to the exit code. */
export async function main(argv: string[]): Promise<number> {
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
    if (err instanceof InputError) {
      process.stderr.write(`pile-atlas ${name}: error: ${err.message}\n`);
      return EXIT_BAD_INPUT;
    }
    const e = err as Error;
    process.stderr.write(`pile-atlas ${name}: internal error: ${e?.stack ?? String(err)}\n`);
    return EXIT_INTERNAL;
  }
}

const invokedDirectly = process.argv[1] !== undefined && /cli\.[cm]?[jt]s$/.test(process.argv[1]);
if (invokedDirectly) {
  // A reader that stops early (`| head`) closes the pipe: that is not an error of ours.
  process.stdout.on('error', (err: NodeJS.ErrnoException) => {
    if (err.code === 'EPIPE') process.exit(EXIT_OK);
    throw err;
  });
  main(process.argv.slice(2)).then(
    (code) => {
      process.exitCode = code;
    },
    (err: unknown) => {
      process.stderr.write(`pile-atlas: internal error: ${String(err)}\n`);
      process.exitCode = EXIT_INTERNAL;
    },
  );
}
