// Secure response headers. The content security policy allows scripts, styles and images only
// from this server (no inline script or style: htmx is configured not to inject its indicator
// style), and no framing (OWASP ASVS 4.0.3, V14.4 "HTTP Security Headers").
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
