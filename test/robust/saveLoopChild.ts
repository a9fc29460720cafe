/**
 * Child process of the crash test (crashSave.test.ts): saves two versions of a plan over one
 * file with savePlanFile (app/node/files.ts), alternately (A, B, A, …), until it is killed.
 *   saveLoopChild TARGET VERSION_A VERSION_B free
 *       saves forever; prints "ready" once the first save is done (the parent kills it at a
 *       random moment after that).
 *   saveLoopChild TARGET VERSION_A VERSION_B stop SAVE POINT [BYTES]
 *       stops inside save number SAVE (0 = the first) at POINT — "bytes" (once BYTES of the
 *       new text are in the temporary file), "written" (the temporary file is complete and on
 *       disk), "backed-up" (the backup is in place), "renamed" (the new text has its name) —
 *       prints "stopped" and waits there to be killed.
 * Version files hold plan file texts.
 */
import { readFileSync, writeSync } from 'node:fs';
import { parsePlanFile } from '../../core/io/planFile.ts';
import { savePlanFile } from '../../app/node/files.ts';

const [target, a, b, mode, saveArg, point, bytesArg] = process.argv.slice(2);
const versions = [a, b].map((f) => parsePlanFile(readFileSync(f, 'utf8')));
const stopAt = mode === 'stop' ? Number(saveArg) : -1;
const stopBytes = Number(bytesArg ?? 0);

/** Reports the stop and waits, without returning, to be killed. */
function stop(): void {
  writeSync(1, 'stopped\n');
  Atomics.wait(new Int32Array(new SharedArrayBuffer(4)), 0, 0);
}

for (let k = 0; ; k++) {
  const v = versions[k % 2];
  const here = k === stopAt;
  await savePlanFile(target, v.plan, v.system, {
    chunkSize: 256,
    onProgress: (written) => {
      if (here && point === 'bytes' && written >= stopBytes) stop();
    },
    onStep: (step) => {
      if (here && step === point) stop();
    },
  });
  if (k === 0 && mode === 'free') writeSync(1, 'ready\n');
}
