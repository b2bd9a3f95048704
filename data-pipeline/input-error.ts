/**
 * A problem with the user's input (a file, a field, a command-line option, the output directory, the
 * disk the output goes to): the pipeline's ValidationError (layers/validation-error.ts) with a message
 * that already names the file and field. The CLI prints it as one line without a stack trace and exits 2.
 */
import { ValidationError } from '../layers/validation-error';

export class InputError extends ValidationError {
  constructor(message: string) {
    super('', message);
    this.name = 'InputError';
  }
}
