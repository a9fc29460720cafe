/**
 * Vite plugin: writes the Content-Security-Policy of electron.config.ts into index.html as a
 * meta tag, so the renderer carries the same policy whether Electron loads it from disk or the
 * browser-mode server serves it (which also sends it as a header).
 */
import type { Plugin } from 'vite';

export function cspMeta(policy: string): Plugin {
  return {
    name: 'waymark-csp-meta',
    transformIndexHtml(html) {
      // frame-ancestors only works as a header (the server and Electron send it); a meta tag must omit it.
      const metaPolicy = policy
        .split(';')
        .map((d) => d.trim())
        .filter((d) => d !== '' && !d.startsWith('frame-ancestors'))
        .join('; ');
      const tag = `<meta http-equiv="Content-Security-Policy" content="${metaPolicy.replace(/"/g, '&quot;')}">`;
      return html.replace('<!-- csp -->', tag);
    },
  };
}
