/**
 * The handler of the app scheme (`waymark://app/...`): serves files of the built renderer with
 * the app's Content-Security-Policy on every response. Only files inside the renderer folder;
 * anything else is a 404. Reads through an injected `readFile` so tests need no Electron.
 */
import { extname, join, sep } from 'node:path';
import { resolveAppPath } from './security.ts';

const MIME: Record<string, string> = {
  '.html': 'text/html; charset=utf-8',
  '.js': 'text/javascript; charset=utf-8',
  '.css': 'text/css; charset=utf-8',
  '.json': 'application/json; charset=utf-8',
  '.map': 'application/json; charset=utf-8',
  '.svg': 'image/svg+xml',
  '.png': 'image/png',
  '.woff2': 'font/woff2',
};

export function createAppProtocolHandler(rendererDir: string, readFile: (path: string) => Promise<Uint8Array>, contentSecurityPolicy: string): (request: { url: string }) => Promise<Response> {
  return async (request) => {
    const file = resolveAppPath(rendererDir, request.url, join, sep);
    const headers = { 'Content-Security-Policy': contentSecurityPolicy, 'X-Content-Type-Options': 'nosniff' };
    if (!file) return new Response('not found', { status: 404, headers });
    try {
      const body = await readFile(file);
      return new Response(body as BodyInit, { status: 200, headers: { ...headers, 'Content-Type': MIME[extname(file)] ?? 'application/octet-stream' } });
    } catch {
      return new Response('not found', { status: 404, headers });
    }
  };
}
