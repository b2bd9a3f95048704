/** The shape of one `pile-atlas` command module (data-pipeline/commands/<name>.ts). */
export interface Command {
  name: string;
  /** One line for the top-level help. */
  summary: string;
  /** Full help text for `pile-atlas <name> --help`. */
  help: string;
  /** Runs the command; resolves to the process exit code (0 only on success). */
  run(argv: string[]): Promise<number>;
}
