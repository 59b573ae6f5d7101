// Worker threads do not inherit tsx's loader on Node 20: register it, then load the TypeScript worker.
import { register } from 'tsx/esm/api';

register();
const mod = await import('./clipWorker.ts');
export default mod.default;
