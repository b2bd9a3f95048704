/** Reads a command's JSON input from a file, or from standard input when the name is `-`. */
import { InputError } from '../input-error';
import { MAX_JSON_BYTES, parseJsonText, readJsonFile } from '../read/read-json-file';

async function readStdin(): Promise<string> {
  const chunks: Buffer[] = [];
  let bytes = 0;
  for await (const c of process.stdin) {
    bytes += (c as Buffer).byteLength;
    if (bytes > MAX_JSON_BYTES) throw new InputError(`stdin: over the limit of ${MAX_JSON_BYTES} bytes`);
    chunks.push(c as Buffer);
  }
  return Buffer.concat(chunks).toString('utf8');
}

/** Parsed JSON of `file` (or stdin for `-`); an unreadable file or bad JSON is an InputError naming it. */
export async function readJsonInput(file: string): Promise<unknown> {
  if (file !== '-') return readJsonFile(file, file);
  let text: string;
  try {
    text = await readStdin();
  } catch (err) {
    if (err instanceof InputError) throw err;
    throw new InputError(`stdin: cannot read (${(err as NodeJS.ErrnoException).code ?? String(err)})`);
  }
  return parseJsonText('-', text);
}
