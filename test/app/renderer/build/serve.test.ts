import { mkdtempSync, mkdirSync, writeFileSync } from 'node:fs';
import { createServer } from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { serveStatic, type Served } from '../../../../app/renderer/build/serve.ts';

const root = mkdtempSync(join(tmpdir(), 'waymark-serve-'));
mkdirSync(join(root, 'assets'));
writeFileSync(join(root, 'index.html'), '<!doctype html><title>w</title>');
writeFileSync(join(root, 'assets', 'a.js'), 'export {}');
writeFileSync(join(tmpdir(), 'waymark-secret.txt'), 'secret');
let s: Served;

beforeAll(async () => {
  s = await serveStatic({ root, host: '127.0.0.1', port: 0, contentSecurityPolicy: "default-src 'self'" });
});
afterAll(() => s.close());

describe('browser-mode server', () => {
  it('serves the index with the CSP and no-sniff headers', async () => {
    const r = await fetch(s.url);
    expect(r.status).toBe(200);
    expect(r.headers.get('content-type')).toMatch(/text\/html/);
    expect(r.headers.get('content-security-policy')).toBe("default-src 'self'");
    expect(r.headers.get('x-content-type-options')).toBe('nosniff');
    expect(await r.text()).toMatch(/<title>w<\/title>/);
  });
  it('serves scripts as JavaScript', async () => {
    const r = await fetch(`${s.url}assets/a.js`);
    expect(r.headers.get('content-type')).toMatch(/text\/javascript/);
  });
  it('never leaves its folder', async () => {
    const r = await fetch(`${s.url}..%2f..%2fwaymark-secret.txt`);
    expect([403, 404]).toContain(r.status);
    expect(await r.text()).not.toBe('secret');
  });
  it('refuses methods other than GET and HEAD', async () => {
    expect((await fetch(s.url, { method: 'POST', body: 'x' })).status).toBe(405);
  });
  it('answers 404 for missing files', async () => {
    expect((await fetch(`${s.url}nope.js`)).status).toBe(404);
  });
  it('falls back to a free port when the configured one is taken', async () => {
    const blocker = createServer();
    await new Promise<void>((r) => blocker.listen(0, '127.0.0.1', () => r()));
    const taken = (blocker.address() as { port: number }).port;
    const s2 = await serveStatic({ root, host: '127.0.0.1', port: taken, contentSecurityPolicy: '' });
    expect(s2.port).not.toBe(taken);
    expect((await fetch(s2.url)).status).toBe(200);
    await s2.close();
    blocker.close();
  });
});
