/**
 * How `npm start` picks the desktop window or browser mode, with the machine faked: nothing is
 * downloaded. The installer runs at most once per Electron version after a failure, never when
 * skipped, and a failure ends in browser mode with one line saying why.
 */
import { mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { FAILED_MARKER, chooseRuntime, firstLine, nodeRuntimeEnv, type InstallOutcome, type RuntimeEnv } from '../../app/desktopRuntime.ts';

interface Fake extends RuntimeEnv {
  installs: number[];
  said: string[];
  marker: string | null;
}

/** A machine with the electron package at `version` (null: not installed) and the runtime binary present or not. */
function machine(o: {
  version?: string | null;
  binary?: boolean;
  env?: Record<string, string>;
  install?: InstallOutcome;
  installLeavesBinary?: boolean;
  marker?: string | null;
}): Fake {
  let binary = o.binary ?? false;
  const f: Fake = {
    installs: [],
    said: [],
    marker: o.marker ?? null,
    env: o.env ?? {},
    electronVersion: () => (o.version === undefined ? '40.10.2' : o.version),
    binary: () => (binary ? '/repo/node_modules/electron/dist/electron' : null),
    readMarker: () => f.marker,
    writeMarker: (t) => {
      f.marker = t;
    },
    async runInstaller(timeoutMs) {
      f.installs.push(timeoutMs);
      const r = o.install ?? { ok: false, reason: 'getaddrinfo ENOTFOUND github.com' };
      if (r.ok && o.installLeavesBinary !== false) binary = true;
      return r;
    },
    say: (l) => {
      f.said.push(l);
    },
    now: () => new Date('2026-03-04T05:06:07Z'),
  };
  return f;
}

describe('npm start: desktop window or browser mode', () => {
  it('runs the installed runtime without downloading', async () => {
    const m = machine({ binary: true });
    expect(await chooseRuntime(m)).toEqual({ kind: 'electron', binary: '/repo/node_modules/electron/dist/electron', downloaded: false });
    expect(m.installs).toEqual([]);
  });

  it("downloads a missing runtime once with electron's installer, within the time limit, then opens the window", async () => {
    const m = machine({ install: { ok: true } });
    expect(await chooseRuntime(m, 60_000)).toEqual({ kind: 'electron', binary: '/repo/node_modules/electron/dist/electron', downloaded: true });
    expect(m.installs).toEqual([60_000]);
    expect(m.said).toHaveLength(1);
    expect(m.said[0]).toMatch(/downloading it once \(up to 60 s; WAYMARK_BROWSER=1 skips this\)/);
    expect(m.marker).toBeNull();
  });

  it('falls back to browser mode with the reason when the download fails, and does not try again on the next start', async () => {
    const m = machine({});
    const first = await chooseRuntime(m);
    expect(first).toEqual({ kind: 'browser', reason: 'the Electron runtime could not be downloaded (getaddrinfo ENOTFOUND github.com)' });
    expect(JSON.parse(m.marker!)).toEqual({ version: '40.10.2', at: '2026-03-04T05:06:07.000Z', reason: 'getaddrinfo ENOTFOUND github.com' });
    const second = await chooseRuntime(m);
    expect(second.kind).toBe('browser');
    expect((second as { reason: string }).reason).toBe(
      `downloading the Electron 40.10.2 runtime failed on 2026-03-04 (getaddrinfo ENOTFOUND github.com); delete ${FAILED_MARKER} to try again`,
    );
    expect(m.installs).toHaveLength(1);
  });

  it('tries again after an upgrade of electron (the marker is per version), or when the marker is unreadable', async () => {
    const old = JSON.stringify({ version: '40.10.1', at: '2026-01-01T00:00:00Z', reason: 'offline' });
    const upgraded = machine({ marker: old, install: { ok: true } });
    expect((await chooseRuntime(upgraded)).kind).toBe('electron');
    expect(upgraded.installs).toHaveLength(1);
    const garbled = machine({ marker: '{not json', install: { ok: true } });
    expect((await chooseRuntime(garbled)).kind).toBe('electron');
    expect(garbled.installs).toHaveLength(1);
  });

  it('counts an installer that succeeds but leaves no binary, or times out, as a failure', async () => {
    const empty = machine({ install: { ok: true }, installLeavesBinary: false });
    expect(await chooseRuntime(empty)).toEqual({
      kind: 'browser',
      reason: 'the Electron runtime could not be downloaded (the installer finished but left no runtime binary)',
    });
    const slow = machine({ install: { ok: false, reason: 'no answer within 60 s' } });
    expect(await chooseRuntime(slow)).toEqual({ kind: 'browser', reason: 'the Electron runtime could not be downloaded (no answer within 60 s)' });
    expect(slow.marker).not.toBeNull();
  });

  it('never downloads when skipped: WAYMARK_BROWSER=1 (even with the runtime installed) or ELECTRON_SKIP_BINARY_DOWNLOAD (as CI sets it)', async () => {
    const forced = machine({ binary: true, env: { WAYMARK_BROWSER: '1' } });
    expect(await chooseRuntime(forced)).toEqual({ kind: 'browser', reason: 'WAYMARK_BROWSER is set' });
    const ci = machine({ env: { ELECTRON_SKIP_BINARY_DOWNLOAD: '1' } });
    expect(await chooseRuntime(ci)).toEqual({ kind: 'browser', reason: 'the Electron runtime is not installed and ELECTRON_SKIP_BINARY_DOWNLOAD is set' });
    // an installed runtime still runs under ELECTRON_SKIP_BINARY_DOWNLOAD: it only stops downloads
    expect((await chooseRuntime(machine({ binary: true, env: { ELECTRON_SKIP_BINARY_DOWNLOAD: '1' } }))).kind).toBe('electron');
    // WAYMARK_BROWSER=0 is not a request for browser mode
    expect((await chooseRuntime(machine({ binary: true, env: { WAYMARK_BROWSER: '0' } }))).kind).toBe('electron');
    for (const m of [forced, ci]) {
      expect(m.installs).toEqual([]);
      expect(m.marker).toBeNull();
    }
  });

  it('without the electron package there is nothing to run: browser mode, no attempt', async () => {
    const m = machine({ version: null });
    expect(await chooseRuntime(m)).toEqual({ kind: 'browser', reason: 'the electron package is not installed (run npm install)' });
    expect(m.installs).toEqual([]);
  });

  it("reduces an installer's stack trace to its first line", () => {
    expect(firstLine('\n  RequestError: getaddrinfo ENOTFOUND github.com\n    at ClientRequest.<anonymous> (x.js:1:1)\n')).toBe(
      'RequestError: getaddrinfo ENOTFOUND github.com',
    );
    expect(firstLine('x'.repeat(500), 20)).toBe(`${'x'.repeat(19)}…`);
  });
});

describe('the real machine (a fake electron package in a temporary folder: its installer is a local script)', () => {
  const repo = mkdtempSync(join(tmpdir(), 'waymark-runtime-'));
  afterAll(() => rmSync(repo, { recursive: true, force: true }));
  const pkg = join(repo, 'node_modules', 'electron');
  mkdirSync(pkg, { recursive: true });
  writeFileSync(join(repo, 'package.json'), '{"name":"r","version":"1.0.0"}');
  writeFileSync(join(pkg, 'package.json'), '{"name":"electron","version":"40.10.2","main":"index.js"}');
  writeFileSync(join(pkg, 'index.js'), '');

  it('reads the version and the binary from the package, runs its install.js, and keeps the marker under node_modules/.cache/waymark/', async () => {
    const said: string[] = [];
    const env = nodeRuntimeEnv(repo, (l) => said.push(l));
    expect(env.electronVersion()).toBeNull(); // no install.js yet: not a usable electron package
    writeFileSync(join(pkg, 'install.js'), "console.error('Error: offline here'); process.exit(1);\n");
    expect(env.electronVersion()).toBe('40.10.2');
    expect(env.binary()).toBeNull();
    expect(await env.runInstaller(30_000)).toEqual({ ok: false, reason: 'Error: offline here' });
    env.writeMarker('{"version":"40.10.2"}');
    expect(env.readMarker()).toBe('{"version":"40.10.2"}');
    expect(readFileSync(join(repo, FAILED_MARKER), 'utf8')).toBe('{"version":"40.10.2"}');
    // an installer that writes the runtime the way electron's does (path.txt naming the binary under dist/)
    writeFileSync(
      join(pkg, 'install.js'),
      "const fs = require('fs'); fs.mkdirSync(__dirname + '/dist', { recursive: true }); fs.writeFileSync(__dirname + '/dist/electron', ''); fs.writeFileSync(__dirname + '/path.txt', 'electron');\n",
    );
    expect(await env.runInstaller(30_000)).toEqual({ ok: true });
    expect(env.binary()).toBe(join(pkg, 'dist', 'electron'));
  });

  it('gives up on an installer that does not finish within the limit', async () => {
    writeFileSync(join(pkg, 'install.js'), 'setInterval(() => {}, 1000);\n');
    const env = nodeRuntimeEnv(repo, () => undefined);
    // the limit is the bound under test: 300 ms is far below what the hanging script would take (forever)
    expect(await env.runInstaller(300)).toEqual({ ok: false, reason: 'no answer within 300 ms' });
  });
});
