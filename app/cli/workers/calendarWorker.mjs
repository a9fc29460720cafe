// Worker-thread entry for the calendar pool: worker threads do not inherit tsx's loader from
// the main thread, so register it here before loading the TypeScript worker body.
import { register } from 'tsx/esm/api';

register();
const worker = await import('./calendarWorker.ts');
export default worker.default;
