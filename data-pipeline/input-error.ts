/**
 * A problem with the user's input (a file, a field, a command-line option). The CLI prints its message
 * as one line without a stack trace and exits non-zero; the message names the file and field.
 */
import type { z } from 'zod';

export class InputError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'InputError';
  }
}

/** One line listing every zod issue of `error` as `<file>: <path>: <message>`. */
export function formatZodIssues(file: string, error: z.ZodError): string {
  return error.issues
    .map((issue) => {
      const path = issue.path.length > 0 ? issue.path.map(String).join('.') : '(root)';
      return `${file}: ${path}: ${issue.message}`;
    })
    .join('; ');
}
