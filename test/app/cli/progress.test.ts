import { describe, expect, it } from 'vitest';
import { createProgress, progressEnabled } from '../../../app/cli/progress.ts';

describe('progress bar', () => {
  it('is drawn only on a terminal and never with machine-readable output', () => {
    expect(progressEnabled(false, { isTTY: true })).toBe(true);
    expect(progressEnabled(true, { isTTY: true })).toBe(false);
    expect(progressEnabled(false, { isTTY: false })).toBe(false);
    expect(progressEnabled(false, {})).toBe(false);
  });

  it('a disabled bar writes nothing', () => {
    const write = process.stderr.write;
    let written = 0;
    process.stderr.write = ((chunk: unknown) => {
      written += String(chunk).length;
      return true;
    }) as typeof process.stderr.write;
    try {
      const bar = createProgress('porkchop', 'cells', false);
      bar.update(5, 10);
      bar.update(10, 10);
      bar.stop();
      bar.stop();
    } finally {
      process.stderr.write = write;
    }
    expect(written).toBe(0);
  });
});
