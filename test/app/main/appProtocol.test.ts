import { mkdtempSync, mkdirSync, writeFileSync } from 'node:fs';
import { readFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { createAppProtocolHandler } from '../../../app/main/appProtocol.ts';

const root = mkdtempSync(join(tmpdir(), 'waymark-proto-'));
mkdirSync(join(root, 'renderer', 'assets'), { recursive: true });
writeFileSync(join(root, 'renderer', 'index.html'), '<!doctype html>');
writeFileSync(join(root, 'renderer', 'assets', 'a.js'), 'export {}');
writeFileSync(join(root, 'secret.json'), '{"secret":1}');
const handle = createAppProtocolHandler(join(root, 'renderer'), (p) => readFile(p), "default-src 'self'");

describe('app scheme handler', () => {
  it('serves renderer files with their type and the CSP', async () => {
    const r = await handle({ url: 'waymark://app/assets/a.js' });
    expect(r.status).toBe(200);
    expect(r.headers.get('content-type')).toMatch(/text\/javascript/);
    expect(r.headers.get('content-security-policy')).toBe("default-src 'self'");
    expect(await r.text()).toBe('export {}');
    expect(await (await handle({ url: 'waymark://app/' })).text()).toBe('<!doctype html>');
  });
  it('serves nothing outside the renderer folder', async () => {
    const r = await handle({ url: 'waymark://app/..%2fsecret.json' });
    expect(r.status).toBe(404);
    expect(await r.text()).not.toContain('secret');
  });
});

describe('content types', () => {
  it('the app scheme and browser mode type every built file alike, from one table', async () => {
    const { MIME } = await import('../../../app/renderer/build/mime.ts');
    for (const [ext, type] of Object.entries(MIME)) {
      writeFileSync(join(root, 'renderer', `f${ext}`), 'x');
      expect((await handle({ url: `waymark://app/f${ext}` })).headers.get('content-type'), ext).toBe(type);
    }
    // the extension decides regardless of case; an unknown one is opaque bytes (with nosniff)
    writeFileSync(join(root, 'renderer', 'g.JS'), 'x');
    writeFileSync(join(root, 'renderer', 'h.bin'), 'x');
    expect((await handle({ url: 'waymark://app/g.JS' })).headers.get('content-type')).toBe('text/javascript; charset=utf-8');
    expect((await handle({ url: 'waymark://app/h.bin' })).headers.get('content-type')).toBe('application/octet-stream');
  });
});
