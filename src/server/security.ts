// Secure response headers. The content security policy allows scripts, styles and images only
// from this server (no inline script or style: htmx is configured not to inject its indicator
// style), and no framing (OWASP ASVS 4.0.3, V14.4 "HTTP Security Headers").
import type { Context, MiddlewareHandler } from 'hono';
import { secureHeaders } from 'hono/secure-headers';
import type { AppEnv } from './types.js';

export const CONTENT_SECURITY_POLICY = {
  defaultSrc: ["'self'"],
  scriptSrc: ["'self'"],
  styleSrc: ["'self'"],
  imgSrc: ["'self'", 'data:'],
  connectSrc: ["'self'"],
  fontSrc: ["'self'"],
  objectSrc: ["'none'"],
  baseUri: ["'none'"],
  formAction: ["'self'"],
  frameAncestors: ["'none'"],
};

/** One year (common practice), without `includeSubDomains`: other names under the lab's domain
 * are not Themata's to commit to HTTPS (OWASP ASVS 4.0.3 V14.4.5). */
export const STRICT_TRANSPORT_SECURITY = 'max-age=31536000';

/**
 * Does this response reach the browser over HTTPS? Either Themata serves TLS itself (the socket
 * @hono/node-server passes on as `incoming` is encrypted; the request line cannot fake that, unlike
 * the URL's scheme), or the operator declared a TLS proxy in front by turning on secure cookies.
 */
export function servedOverHttps(c: Context<AppEnv>): boolean {
  const bindings = c.env as { incoming?: { socket?: { encrypted?: boolean } } } | undefined;
  return bindings?.incoming?.socket?.encrypted === true || c.get('deps')?.secureCookies === true;
}

export function securityHeaders(): MiddlewareHandler<AppEnv> {
  const headers = secureHeaders({
    contentSecurityPolicy: CONTENT_SECURITY_POLICY,
    referrerPolicy: 'same-origin',
    xFrameOptions: 'DENY',
    crossOriginEmbedderPolicy: false,
    strictTransportSecurity: false,
  });
  return async (c, next) => {
    await headers(c, next);
    // RFC 6797 (HTTP Strict Transport Security) §7.2: a host must not send the header over plain
    // HTTP, so it goes on HTTPS responses only.
    if (servedOverHttps(c)) c.res.headers.set('Strict-Transport-Security', STRICT_TRANSPORT_SECURITY);
  };
}

/** Every response that does not choose its own caching is `no-store`: pages and downloads show
 * answers, which may identify people, and must not stay in a browser's or proxy's cache
 * (OWASP ASVS 4.0.3 V8.2.1). Static assets set their own `Cache-Control` and keep it. */
export function noStore(): MiddlewareHandler {
  return async (c, next) => {
    await next();
    if (!c.res.headers.has('Cache-Control')) c.res.headers.set('Cache-Control', 'no-store');
  };
}

/**
 * What the server writes to its console about an unexpected error: its kind, code and the code
 * lines it passed through, never its message, which may quote an answer (a JSON or SQL error
 * quotes the text it choked on). Nothing else is logged: no requests, passwords or session tokens
 * (OWASP ASVS 4.0.3 V7.1.1, V7.1.2). With `THEMATA_DEBUG` set, as for the command line, the whole
 * error is printed, for an operator tracking a fault down on data they may see.
 */
export function describeUnexpectedError(error: unknown, env: Record<string, string | undefined> = process.env): string {
  if (env.THEMATA_DEBUG) return error instanceof Error ? (error.stack ?? `${error.name}: ${error.message}`) : String(error);
  if (!(error instanceof Error)) return `Unexpected failure (a thrown ${typeof error}; its value is not shown, as it may quote survey answers).`;
  const code = (error as { code?: unknown }).code;
  // V8 writes the stack as "Name: message" and then one line per frame; drop the first part whole
  // (a message may span lines) and keep frame lines only.
  const stack = error.stack ?? '';
  const header = String(error);
  const rest = stack.startsWith(header) ? stack.slice(header.length) : '';
  const frames = rest.split('\n').filter((line) => /^\s+at \S.*:\d+:\d+\)?$/.test(line)).slice(0, 10);
  const head = `Unexpected ${error.name}${typeof code === 'string' && /^[A-Z0-9_]{1,40}$/.test(code) ? ` (${code})` : ''}; ` +
    'its message is not shown, as it may quote survey answers (set THEMATA_DEBUG=1 to see it).';
  return [head, ...frames].join('\n');
}
