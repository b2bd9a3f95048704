#!/usr/bin/env node
// Entry point of the `pile-atlas` command line. The TypeScript CLI runs in this very process (tsx
// registered as a loader), not in a child: a signal sent to this process reaches the build itself,
// which removes its partial output, and no child process can outlive it.
import { register } from 'tsx/esm/api';

register();
const { runCliProcess } = await import('../data-pipeline/cli.ts');
runCliProcess(process.argv.slice(2));
