/**
 * Child process of the crash test (crashSave.test.ts): saves two versions of a plan over one
 * file with savePlanFile (app/node/files.ts), alternately and forever, until it is killed.
 *   saveLoopChild TARGET VERSION_A VERSION_B      (version files: plan file texts)
 * Prints "ready" once the first save is done.
 */
import { readFileSync, writeSync } from 'node:fs';
import { parsePlanFile } from '../../core/io/planFile.ts';
import { savePlanFile } from '../../app/node/files.ts';

const [target, a, b] = process.argv.slice(2);
const versions = [a, b].map((f) => parsePlanFile(readFileSync(f, 'utf8')));
for (let k = 0; ; k++) {
  const v = versions[k % 2];
  await savePlanFile(target, v.plan, v.system);
  if (k === 0) writeSync(1, 'ready\n');
}
