import { mkdtempSync, mkdirSync, utimesSync, writeFileSync } from 'node:fs';
import { readFile } from 'node:fs/promises';
import { connect, createServer } from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { allowedHosts, serveStatic, type Served } from '../../../../app/renderer/build/serve.ts';

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

/** A GET with a Host header of our choosing (fetch may not set Host), or none at all (HTTP/1.0). */
function rawGet(port: number, host: string | null, path = '/'): Promise<{ status: number; body: string }> {
  return new Promise((resolve, reject) => {
    const sock = connect(port, '127.0.0.1', () => sock.write(`GET ${path} HTTP/1.0\r\n${host === null ? '' : `Host: ${host}\r\n`}\r\n`));
    let data = '';
    sock.on('data', (b) => (data += b.toString('latin1')));
    sock.on('end', () => {
      const [head, ...rest] = data.split('\r\n\r\n');
      resolve({ status: Number(head.split(' ')[1]), body: rest.join('\r\n\r\n') });
    });
    sock.on('error', reject);
  });
}

describe('browser-mode server: who may ask, and what it costs', () => {
  it('answers only requests addressed to a loopback name and its own port; others get 421 with no content (DNS rebinding)', async () => {
    const p = s.port;
    for (const host of [`127.0.0.1:${p}`, `localhost:${p}`, `LOCALHOST:${p}`, `[::1]:${p}`]) expect((await rawGet(p, host)).status, host).toBe(200);
    for (const host of [`evil.example:${p}`, 'evil.example', `127.0.0.1:${p + 1}`, '127.0.0.1', `localhost.evil.example:${p}`, `127.0.0.2:${p}`]) {
      const r = await rawGet(p, host);
      expect(r.status, host).toBe(421);
      expect(r.body, host).toBe('');
    }
    const none = await rawGet(p, null);
    expect(none.status).toBe(421);
    expect(none.body).toBe('');
    expect(allowedHosts(5317)).toEqual(new Set(['127.0.0.1:5317', 'localhost:5317', '[::1]:5317']));
  });

  it('reads each file from disk once however many requests ask for it, concurrent or not, and again only when it changes', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'waymark-serve-cache-'));
    writeFileSync(join(dir, 'index.html'), 'one');
    const reads: string[] = [];
    const counted = await serveStatic({
      root: dir,
      host: '127.0.0.1',
      port: 0,
      contentSecurityPolicy: '',
      readFile: (p) => {
        reads.push(p);
        return readFile(p);
      },
    });
    try {
      const bodies = await Promise.all(Array.from({ length: 50 }, () => fetch(counted.url).then((r) => r.text())));
      for (let k = 0; k < 20; k++) bodies.push(await (await fetch(counted.url)).text());
      expect(new Set(bodies)).toEqual(new Set(['one']));
      expect(reads).toHaveLength(1);
      // a rebuild: new size and modification time
      writeFileSync(join(dir, 'index.html'), 'two!');
      utimesSync(join(dir, 'index.html'), new Date(), new Date(Date.now() + 5000));
      expect(await (await fetch(counted.url)).text()).toBe('two!');
      expect(reads).toHaveLength(2);
    } finally {
      await counted.close();
    }
  });

  it('streams a file over the in-memory limit instead of keeping it', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'waymark-serve-stream-'));
    const big = 'x'.repeat(200_000);
    writeFileSync(join(dir, 'big.js'), big);
    const reads: string[] = [];
    const streamed = await serveStatic({
      root: dir,
      host: '127.0.0.1',
      port: 0,
      contentSecurityPolicy: '',
      maxCachedBytes: 1000,
      readFile: (p) => {
        reads.push(p);
        return readFile(p);
      },
    });
    try {
      for (let k = 0; k < 3; k++) {
        const r = await fetch(`${streamed.url}big.js`);
        expect(r.headers.get('content-length')).toBe(String(big.length));
        expect(await r.text()).toBe(big);
      }
      expect((await fetch(`${streamed.url}big.js`, { method: 'HEAD' })).status).toBe(200);
      expect(reads).toEqual([]);
    } finally {
      await streamed.close();
    }
  });
});
