/**
 * The handler of the app scheme (`waymark://app/...`): serves files of the built renderer with
 * the app's Content-Security-Policy on every response. Only files inside the renderer folder;
 * anything else is a 404. Reads through an injected `readFile` so tests need no Electron.
 * Content types come from the table browser mode's server uses too (app/renderer/build/mime.ts).
 */
import { join, sep } from 'node:path';
import { mimeType } from '../renderer/build/mime.ts';
import { resolveAppPath } from './security.ts';

export function createAppProtocolHandler(
  rendererDir: string,
  readFile: (path: string) => Promise<Uint8Array>,
  contentSecurityPolicy: string,
): (request: { url: string }) => Promise<Response> {
  return async (request) => {
    const file = resolveAppPath(rendererDir, request.url, join, sep);
    const headers = { 'Content-Security-Policy': contentSecurityPolicy, 'X-Content-Type-Options': 'nosniff' };
    if (!file) return new Response('not found', { status: 404, headers });
    try {
      const body = await readFile(file);
      return new Response(body as BodyInit, { status: 200, headers: { ...headers, 'Content-Type': mimeType(file) } });
    } catch {
      return new Response('not found', { status: 404, headers });
    }
  };
}
