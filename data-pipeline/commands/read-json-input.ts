/** Reads a command's JSON input from a file, or from standard input when the name is `-`. */
import { readFile } from 'node:fs/promises';
import { InputError } from '../input-error';

async function readStdin(): Promise<string> {
  const chunks: Buffer[] = [];
  for await (const c of process.stdin) chunks.push(c as Buffer);
  return Buffer.concat(chunks).toString('utf8');
}

/** Parsed JSON of `file` (or stdin for `-`); an unreadable file or bad JSON is an InputError naming it. */
export async function readJsonInput(file: string): Promise<unknown> {
  let text: string;
  try {
    text = file === '-' ? await readStdin() : await readFile(file, 'utf8');
  } catch (err) {
    throw new InputError(`${file}: cannot read (${(err as Error).message})`);
  }
  try {
    return JSON.parse(text);
  } catch (err) {
    throw new InputError(`${file}: not valid JSON (${(err as Error).message})`);
  }
}
