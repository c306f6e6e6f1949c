// Secure response headers. The content security policy allows scripts, styles and images only
// from this server (no inline script or style: htmx is configured not to inject its indicator
// style), and no framing (OWASP ASVS 4.0.3, V14.4 "HTTP Security Headers").
import type { MiddlewareHandler } from 'hono';
import { secureHeaders } from 'hono/secure-headers';

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

export function securityHeaders() {
  return secureHeaders({
    contentSecurityPolicy: CONTENT_SECURITY_POLICY,
    referrerPolicy: 'same-origin',
    xFrameOptions: 'DENY',
    crossOriginEmbedderPolicy: false,
  });
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
