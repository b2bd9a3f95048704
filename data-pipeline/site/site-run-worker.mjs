// Worker-thread entry: loads the TypeScript worker through tsx (the pipeline runs from source).
import { tsImport } from 'tsx/esm/api';

await tsImport('./site-run-worker.ts', import.meta.url);
