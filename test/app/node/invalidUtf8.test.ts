/**
 * Files that are not valid UTF-8 are refused with the byte offset of the first bad byte, by the
 * loaders the command line and the desktop app's main process share, instead of being decoded
 * with U+FFFD in place of the bad bytes (a silently changed name).
 */
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { FileError, loadSystemFile, readTextFile } from '../../../app/node/files.ts';
import { ROOT, runCli } from '../cli/runCli.ts';

const work = mkdtempSync(join(tmpdir(), 'waymark-utf8-'));
afterAll(() => rmSync(work, { recursive: true, force: true }));

const systemText = readFileSync(join(ROOT, 'assets/systems/ilmar.system.json'), 'utf8');

/** The demo system with its first body's name byte-patched: `"Ilmar"` → `"Ilm\xFFr"` (0xFF is never UTF-8). */
function badSystem(): { path: string; offset: number } {
  const bytes = Buffer.from(systemText, 'utf8');
  const at = bytes.indexOf(Buffer.from('"Ilmar"')) + 4;
  expect(at).toBeGreaterThan(4);
  bytes[at] = 0xff;
  const path = join(work, 'bad.system.json');
  writeFileSync(path, bytes);
  return { path, offset: at };
}

describe('files that are not valid UTF-8', () => {
  it('readTextFile and loadSystemFile refuse them with the offset of the bad byte', async () => {
    const { path, offset } = badSystem();
    await expect(readTextFile(path)).rejects.toThrow(FileError);
    await expect(readTextFile(path)).rejects.toThrow(`cannot read ${path}: it is not valid UTF-8 at byte ${offset.toLocaleString('en-US')}`);
    await expect(loadSystemFile(path)).rejects.toThrow(/not valid UTF-8 at byte/);
  });

  it('valid UTF-8 with accents and Δ still reads as written', async () => {
    const path = join(work, 'ok.txt');
    writeFileSync(path, 'Fénix Δv ✓', 'utf8');
    expect(await readTextFile(path)).toBe('Fénix Δv ✓');
  });

  it('the command line exits 2 with the offset', async () => {
    const { path, offset } = badSystem();
    const r = await runCli(['stability', path, '--years', '1']);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain(`not valid UTF-8 at byte ${offset.toLocaleString('en-US')}`);
    expect(r.stdout).toBe('');
  });
});
