/**
 * The packaging script's settings (`npm run package`; packager itself is not run here: it
 * downloads the Electron runtime for the target platform, so it stays out of CI).
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { inPackage, packagerOptions } from '../../app/package.ts';
import config from '../../electron.config.ts';

const pkg = JSON.parse(readFileSync(new URL('../../package.json', import.meta.url), 'utf8'));

describe('packaging the desktop app', () => {
  it('packs the built app, package.json and node_modules (pruned by packager), nothing else', () => {
    for (const p of [
      '',
      '/package.json',
      '/dist',
      '/dist/main',
      '/dist/main/main.js',
      '/dist/preload/preload.cjs',
      '/dist/renderer/index.html',
      '/dist/renderer/assets/index-x.js',
      '/node_modules',
      '/node_modules/ajv/package.json',
    ]) {
      expect(inPackage(p), p).toBe(true);
    }
    for (const p of [
      '/app',
      '/app/main/main.ts',
      '/core/io/units.ts',
      '/test',
      '/assets/systems/ilmar.system.json',
      '/release',
      '/release/Waymark-linux-x64',
      '/dist-old',
      '/dist/other',
      '/package-lock.json',
      '/.git',
      '/README.md',
      '/node_modulesX',
    ]) {
      expect(inPackage(p), p).toBe(false);
    }
  });

  it('packages the pinned Electron with the app version, as an asar archive, from the main process the build writes', () => {
    const o = packagerOptions('/repo', pkg, { platform: 'linux', arch: 'x64' });
    expect(o).toMatchObject({
      dir: '/repo',
      out: '/repo/release',
      name: 'Waymark',
      appVersion: pkg.version,
      electronVersion: '40.10.2',
      platform: 'linux',
      arch: 'x64',
      asar: true,
      prune: true,
    });
    expect(pkg.devDependencies.electron).toBe('40.10.2');
    expect(pkg.main).toBe(config.build.main);
    expect(() => packagerOptions('/repo', { ...pkg, main: 'index.js' })).toThrow(/"main" must be "dist\/main\/main.js"/);
    const ignore = o.ignore as (p: string) => boolean;
    expect(ignore('/dist/main/main.js')).toBe(false);
    expect(ignore('/core/io/units.ts')).toBe(true);
  });

  it('the packager is a pinned development dependency, and electron still downloads nothing at install', () => {
    expect(pkg.devDependencies['@electron/packager']).toMatch(/^\d+\.\d+\.\d+$/);
    expect(pkg.scripts.package).toBe('tsx app/package.ts');
    expect(pkg.allowScripts.electron).toBe(false);
  });
});
