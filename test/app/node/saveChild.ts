/**
 * Child process for the interrupted-save tests (run with `node --import tsx`).
 *   mid-write TARGET BYTES   starts an atomic save of BYTES bytes, reports "half" on stdout when
 *                            half is in the temporary file, then blocks until killed.
 *   loop TARGET A B          saves the texts of files A and B over TARGET alternately, forever,
 *                            reporting "started" after the first save.
 *   save TARGET TEXT         saves TEXT over TARGET once; prints "saved", or the error's message
 *                            (exit code 3). The non-writable-folder test runs it as an
 *                            unprivileged user when the tests run as root.
 */
import { readFileSync, writeSync } from 'node:fs';
import { atomicWriteFile } from '../../../app/node/files.ts';

const [mode, target, ...rest] = process.argv.slice(2);
const block = (): void => {
  Atomics.wait(new Int32Array(new SharedArrayBuffer(4)), 0, 0);
};

if (mode === 'mid-write') {
  const bytes = Number(rest[0]);
  const data = Buffer.alloc(bytes, 0x7a);
  let told = false;
  await atomicWriteFile(target, data, {
    chunkSize: 1 << 16,
    onProgress(written, total) {
      if (!told && written >= total / 2) {
        told = true;
        writeSync(1, 'half\n');
        block();
      }
    },
  });
} else if (mode === 'loop') {
  const texts = [readFileSync(rest[0], 'utf8'), readFileSync(rest[1], 'utf8')];
  for (let k = 0; ; k++) {
    await atomicWriteFile(target, texts[k % 2], { chunkSize: 1 << 14 });
    if (k === 0) writeSync(1, 'started\n');
  }
} else if (mode === 'save') {
  try {
    await atomicWriteFile(target, rest[0]);
    writeSync(1, 'saved\n');
  } catch (e) {
    writeSync(1, `${(e as Error).message}\n`);
    process.exitCode = 3;
  }
} else {
  writeSync(2, `unknown mode ${mode}\n`);
  process.exit(64);
}
