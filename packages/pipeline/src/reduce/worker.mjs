// Worker-thread bootstrap: worker threads do not inherit the parent's TypeScript loader, so
// register it here and load the TypeScript worker.
import { register } from 'tsx/esm/api';

register();
const mod = await import('./worker.ts');
export default mod.default;
