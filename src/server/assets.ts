// Static assets, all served by Themata itself (nothing is fetched from outside): htmx and its SSE
// extension from node_modules, our own CSS, script and icon from public/, and /favicon.ico. Fixed names only: no
// request path is ever used to build a file path.
import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { Hono } from 'hono';
import { faviconIco } from './favicon.js';

const require = createRequire(import.meta.url);
const publicDir = new URL('../../public/', import.meta.url);

const FILES: Record<string, { load: () => Buffer; type: string }> = {
  'htmx.min.js': { load: () => readFileSync(require.resolve('htmx.org/dist/htmx.min.js')), type: 'text/javascript; charset=utf-8' },
  'htmx-sse.js': { load: () => readFileSync(require.resolve('htmx-ext-sse/dist/sse.js')), type: 'text/javascript; charset=utf-8' },
  'app.js': { load: () => readFileSync(new URL('app.js', publicDir)), type: 'text/javascript; charset=utf-8' },
  'password-meter.js': { load: () => readFileSync(new URL('password-meter.js', publicDir)), type: 'text/javascript; charset=utf-8' },
  'app.css': { load: () => readFileSync(new URL('app.css', publicDir)), type: 'text/css; charset=utf-8' },
  'favicon.svg': { load: () => readFileSync(new URL('favicon.svg', publicDir)), type: 'image/svg+xml' },
};

const cache = new Map<string, Buffer>();

export function assetRoutes(): Hono {
  const app = new Hono();
  app.get('/:name', (c) => {
    const name = c.req.param('name');
    const file = Object.hasOwn(FILES, name) ? FILES[name] : undefined;
    if (!file) return c.text('Not found', 404);
    let bytes = cache.get(name);
    if (!bytes) cache.set(name, (bytes = file.load()));
    return c.body(new Uint8Array(bytes), 200, { 'Content-Type': file.type, 'Cache-Control': 'no-cache' });
  });
  return app;
}

/**
 * /favicon.ico, which browsers ask for on every page whatever the page links to. Public like the
 * other assets (it is the same for everyone and says nothing about any study).
 */
export function faviconRoute(): Hono {
  const app = new Hono();
  let bytes: Uint8Array | undefined;
  app.get('/favicon.ico', (c) => c.body((bytes ??= faviconIco()).slice(), 200, { 'Content-Type': 'image/x-icon', 'Cache-Control': 'max-age=86400' }));
  return app;
}
