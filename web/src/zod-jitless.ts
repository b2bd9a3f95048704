/**
 * Import first in every entry point of the app (page and workers): zod 4 compiles fast parsers with
 * `new Function` unless told not to, and under the app's Content-Security-Policy (no 'unsafe-eval',
 * web/build/preview-hardening.ts) even its probe for that is reported as a policy violation. Jitless
 * parsing gives the same results.
 */
import { z } from 'zod';

z.config({ jitless: true });
