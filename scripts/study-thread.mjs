// Entry of a study worker thread (src/lib/server/studies/queue/threadPool.ts starts
// these). tsx loads the TypeScript job runner from source, so the same file
// serves `vite dev`, the built adapter-node server, `npm run worker` and the
// benchmark.
import { register } from 'tsx/esm/api';

register();
await import('../src/lib/server/studies/queue/thread.ts');
