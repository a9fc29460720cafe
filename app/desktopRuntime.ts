/**
 * Which way `npm start` runs Waymark: the desktop window (Electron) or browser mode.
 *
 * `npm install` does not run electron's own install script (`allowScripts.electron=false` in
 * package.json, so installs never fail where its download host cannot be reached), which leaves
 * the Electron runtime binary missing after a normal install. `npm start` therefore fetches it
 * itself, once: when the runtime is missing it runs electron's installer
 * (node_modules/electron/install.js) with a time limit; if that fails, it says why in one line
 * and runs in browser mode, and it remembers the failure (a marker file under
 * node_modules/.cache/waymark/) so later starts go straight to browser mode instead of waiting
 * again. The marker is per Electron version: upgrading electron tries again; deleting the
 * marker does too.
 *
 * Skipped: WAYMARK_BROWSER=1 always runs browser mode; ELECTRON_SKIP_BINARY_DOWNLOAD (any
 * non-empty value, as electron's own installer reads it) never downloads.
 *
 * `chooseRuntime` is the decision alone, with the file system and the installer passed in, so
 * tests exercise it without downloading anything; `nodeRuntimeEnv` is the real machine.
 */
import { spawn } from 'node:child_process';
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { dirname, join } from 'node:path';

/** How long electron's installer may take before `npm start` gives up on it. */
export const INSTALL_TIMEOUT_MS = 60_000;
/** The marker of a failed download, relative to the repository root. */
export const FAILED_MARKER = 'node_modules/.cache/waymark/electron-download-failed.json';

export interface InstallOutcome {
  ok: boolean;
  /** Why it failed, in one line (unset when ok). */
  reason?: string;
}

/** What the decision needs from the machine. */
export interface RuntimeEnv {
  env: Readonly<Record<string, string | undefined>>;
  /** The Electron version the electron package wants (its package.json), or null when the package is not installed. */
  electronVersion(): string | null;
  /** Path of the installed runtime binary, or null. */
  binary(): string | null;
  /** The failed-download marker's text, or null when there is none. */
  readMarker(): string | null;
  writeMarker(text: string): void;
  /** Runs electron's installer, giving up after `timeoutMs`. */
  runInstaller(timeoutMs: number): Promise<InstallOutcome>;
  /** One line of progress for the user. */
  say(line: string): void;
  now(): Date;
}

export type RuntimeChoice = { kind: 'electron'; binary: string; downloaded: boolean } | { kind: 'browser'; reason: string };

const set = (v: string | undefined): boolean => v !== undefined && v !== '';

/** Desktop window or browser mode; may run electron's installer once (see the module comment). */
export async function chooseRuntime(e: RuntimeEnv, timeoutMs = INSTALL_TIMEOUT_MS): Promise<RuntimeChoice> {
  if (set(e.env.WAYMARK_BROWSER) && e.env.WAYMARK_BROWSER !== '0') return { kind: 'browser', reason: 'WAYMARK_BROWSER is set' };
  const installed = e.binary();
  if (installed) return { kind: 'electron', binary: installed, downloaded: false };
  const version = e.electronVersion();
  if (version === null) return { kind: 'browser', reason: 'the electron package is not installed (run npm install)' };
  if (set(e.env.ELECTRON_SKIP_BINARY_DOWNLOAD)) {
    return { kind: 'browser', reason: 'the Electron runtime is not installed and ELECTRON_SKIP_BINARY_DOWNLOAD is set' };
  }
  const earlier = parseMarker(e.readMarker());
  if (earlier && earlier.version === version) {
    return {
      kind: 'browser',
      reason: `downloading the Electron ${version} runtime failed on ${earlier.at.slice(0, 10)} (${earlier.reason}); delete ${FAILED_MARKER} to try again`,
    };
  }
  e.say(`Electron ${version} runtime not installed: downloading it once (up to ${Math.round(timeoutMs / 1000)} s; WAYMARK_BROWSER=1 skips this) ...`);
  const outcome = await e.runInstaller(timeoutMs);
  const binary = outcome.ok ? e.binary() : null;
  if (binary) return { kind: 'electron', binary, downloaded: true };
  const reason = outcome.ok ? 'the installer finished but left no runtime binary' : (outcome.reason ?? 'the installer failed');
  e.writeMarker(`${JSON.stringify({ version, at: e.now().toISOString(), reason }, null, 2)}\n`);
  return { kind: 'browser', reason: `the Electron runtime could not be downloaded (${reason})` };
}

function parseMarker(text: string | null): { version: string; at: string; reason: string } | null {
  if (text === null) return null;
  try {
    const m = JSON.parse(text) as { version?: unknown; at?: unknown; reason?: unknown };
    return typeof m.version === 'string' ? { version: m.version, at: String(m.at ?? ''), reason: String(m.reason ?? 'unknown') } : null;
  } catch {
    return null;
  }
}

/** The first non-empty line of an installer's output, shortened: the reason a user reads. */
export function firstLine(output: string, max = 160): string {
  const line =
    output
      .split(/\r?\n/)
      .map((l) => l.trim())
      .find((l) => l !== '') ?? '';
  return line.length > max ? `${line.slice(0, max - 1)}…` : line;
}

/** The real machine: the electron package under `repo`'s node_modules, the marker beside it. */
export function nodeRuntimeEnv(repo: string, say: (line: string) => void = (l) => console.log(l)): RuntimeEnv {
  const require = createRequire(join(repo, 'package.json'));
  const electronDir = (): string | null => {
    try {
      return dirname(require.resolve('electron/package.json'));
    } catch {
      return null;
    }
  };
  const marker = join(repo, FAILED_MARKER);
  return {
    env: process.env,
    electronVersion() {
      const d = electronDir();
      if (!d || !existsSync(join(d, 'install.js'))) return null;
      return (JSON.parse(readFileSync(join(d, 'package.json'), 'utf8')) as { version: string }).version;
    },
    binary() {
      // read electron's path.txt afresh (require('electron') would keep an earlier answer)
      const d = electronDir();
      if (!d) return null;
      try {
        const bin = join(d, 'dist', readFileSync(join(d, 'path.txt'), 'utf8').trim());
        return existsSync(bin) ? bin : null;
      } catch {
        return null;
      }
    },
    readMarker: () => (existsSync(marker) ? readFileSync(marker, 'utf8') : null),
    writeMarker(text) {
      mkdirSync(dirname(marker), { recursive: true });
      writeFileSync(marker, text);
    },
    runInstaller(timeoutMs) {
      const d = electronDir();
      if (!d) return Promise.resolve({ ok: false, reason: 'the electron package is not installed' });
      return new Promise((resolve) => {
        const child = spawn(process.execPath, [join(d, 'install.js')], { cwd: d, stdio: ['ignore', 'pipe', 'pipe'] });
        let output = '';
        const keep = (b: Buffer): void => {
          if (output.length < 65536) output += b.toString();
        };
        child.stdout.on('data', keep);
        child.stderr.on('data', keep);
        const timer = setTimeout(() => {
          child.kill('SIGKILL');
          resolve({ ok: false, reason: `no answer within ${timeoutMs >= 1000 ? `${Math.round(timeoutMs / 1000)} s` : `${timeoutMs} ms`}` });
        }, timeoutMs);
        child.on('error', (err) => {
          clearTimeout(timer);
          resolve({ ok: false, reason: err.message });
        });
        child.on('close', (code) => {
          clearTimeout(timer);
          resolve(code === 0 ? { ok: true } : { ok: false, reason: firstLine(output) || `the installer exited with code ${code}` });
        });
      });
    },
    say,
    now: () => new Date(),
  };
}
