// Entry of a fit thread (src/lib/server/offload/pool.ts starts these): fit previews
// and the fits a study launch builds run here, off the request thread. tsx loads
// the TypeScript from source, as for scripts/study-thread.mjs.
import { register } from 'tsx/esm/api';

register();
await import('../src/lib/server/offload/thread.ts');
