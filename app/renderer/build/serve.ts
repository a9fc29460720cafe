/**
 * Browser mode's server: serves the built renderer (dist/renderer) on 127.0.0.1 with the app's
 * Content-Security-Policy as a header. Static files only: GET and HEAD, no directory listing,
 * nothing outside the folder, no HTTP caching (a rebuild shows at once).
 *
 * - Only requests addressed to this server by a loopback name are answered: the Host header
 *   must be `127.0.0.1:<port>`, `localhost:<port>` or `[::1]:<port>`. A page on another site
 *   whose DNS name is re-pointed at 127.0.0.1 (DNS rebinding) sends its own name as the Host and
 *   gets 421 with no content (RFC 9110 §15.5.20, Misdirected Request).
 * - Each file is read from disk once and kept in memory while its size and modification time
 *   stay the same (the built files are a few MB in all); concurrent requests for a file share
 *   one read, so memory does not grow with the number of requests. Files over MAX_CACHED_BYTES
 *   are streamed from disk instead.
 */
import { createReadStream } from 'node:fs';
import { createServer, type Server } from 'node:http';
import { readFile, stat } from 'node:fs/promises';
import { join, normalize, sep } from 'node:path';
import type { AddressInfo } from 'node:net';
import { mimeType } from './mime.ts';

/** Files up to this size are kept in memory; larger ones are streamed per request. */
export const MAX_CACHED_BYTES = 32 * 1024 * 1024;

/** Host header values this server answers on `port` (loopback names only). */
export function allowedHosts(port: number): Set<string> {
  return new Set([`127.0.0.1:${port}`, `localhost:${port}`, `[::1]:${port}`]);
}

interface CachedFile {
  size: number;
  mtimeMs: number;
  body: Promise<Buffer>;
}

export interface ServeOptions {
  root: string;
  host: string;
  /** Preferred port; when taken (or 0), a free one is used. */
  port: number;
  contentSecurityPolicy: string;
  /** Reads a whole file (default node:fs/promises readFile; tests count the reads). */
  readFile?: (path: string) => Promise<Buffer>;
  /** Files larger than this are streamed, not kept (default MAX_CACHED_BYTES). */
  maxCachedBytes?: number;
}

export interface Served {
  server: Server;
  url: string;
  port: number;
  close(): Promise<void>;
}

function listen(server: Server, host: string, port: number): Promise<number> {
  return new Promise((resolve, reject) => {
    const onError = (err: NodeJS.ErrnoException) => {
      server.off('listening', onListening);
      reject(err);
    };
    const onListening = () => {
      server.off('error', onError);
      resolve((server.address() as AddressInfo).port);
    };
    server.once('error', onError);
    server.once('listening', onListening);
    server.listen(port, host);
  });
}

export async function serveStatic(o: ServeOptions): Promise<Served> {
  const root = normalize(o.root + sep);
  const cache = new Map<string, CachedFile>();
  let hosts = new Set<string>();
  /** The file's bytes from memory, read once per (size, modification time). */
  function cached(file: string, size: number, mtimeMs: number): Promise<Buffer> {
    const hit = cache.get(file);
    if (hit && hit.size === size && hit.mtimeMs === mtimeMs) return hit.body;
    const body = (o.readFile ?? readFile)(file);
    cache.set(file, { size, mtimeMs, body });
    body.catch(() => cache.delete(file));
    return body;
  }
  const server = createServer(async (req, res) => {
    const headers = {
      'Content-Security-Policy': o.contentSecurityPolicy,
      'X-Content-Type-Options': 'nosniff',
      'Cross-Origin-Opener-Policy': 'same-origin',
      'Cross-Origin-Embedder-Policy': 'require-corp',
      'Referrer-Policy': 'no-referrer',
      'Cache-Control': 'no-store',
    };
    if (!hosts.has((req.headers.host ?? '').toLowerCase())) {
      res.writeHead(421, { ...headers, 'Content-Length': 0 }).end();
      return;
    }
    if (req.method !== 'GET' && req.method !== 'HEAD') {
      res.writeHead(405, { ...headers, Allow: 'GET, HEAD' }).end();
      return;
    }
    let pathname: string;
    try {
      pathname = decodeURIComponent(new URL(req.url ?? '/', 'http://x').pathname);
    } catch {
      res.writeHead(400, headers).end();
      return;
    }
    if (pathname.endsWith('/')) pathname += 'index.html';
    const file = normalize(join(root, pathname));
    if (!file.startsWith(root)) {
      res.writeHead(403, headers).end();
      return;
    }
    try {
      const st = await stat(file);
      if (!st.isFile()) throw new Error('not a file');
      const type = { ...headers, 'Content-Type': mimeType(file) };
      if (st.size > (o.maxCachedBytes ?? MAX_CACHED_BYTES)) {
        res.writeHead(200, { ...type, 'Content-Length': st.size });
        if (req.method === 'HEAD') res.end();
        else
          createReadStream(file)
            .on('error', () => res.destroy())
            .pipe(res);
        return;
      }
      const body = await cached(file, st.size, st.mtimeMs);
      res.writeHead(200, { ...type, 'Content-Length': body.length });
      res.end(req.method === 'HEAD' ? undefined : body);
    } catch {
      if (!res.headersSent) res.writeHead(404, { ...headers, 'Content-Type': 'text/plain; charset=utf-8' }).end('not found');
    }
  });
  let port: number;
  try {
    port = await listen(server, o.host, o.port);
  } catch (err) {
    if ((err as NodeJS.ErrnoException).code !== 'EADDRINUSE' && (err as NodeJS.ErrnoException).code !== 'EACCES') throw err;
    port = await listen(server, o.host, 0);
  }
  hosts = allowedHosts(port);
  return {
    server,
    port,
    url: `http://${o.host}:${port}/`,
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}
