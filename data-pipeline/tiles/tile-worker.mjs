// Worker-thread entry: loads the TypeScript tile worker through tsx (the pipeline runs from source).
import { tsImport } from 'tsx/esm/api';

await tsImport('./tile-worker.ts', import.meta.url);
