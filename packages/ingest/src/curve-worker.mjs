// Worker-thread bootstrap: worker threads do not inherit the parent's TypeScript loader, so
// register it here and load the TypeScript task.
import { register } from 'tsx/esm/api';

register();
const mod = await import('./curve-task.ts');
export default mod.default;
