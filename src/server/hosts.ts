// Which host names the workbench answers to. A server on 127.0.0.1 with no accounts trusts
// everyone who reaches it, so a web page whose own domain name is re-pointed to 127.0.0.1
// ("DNS rebinding": Jackson et al., "Protecting Browsers from DNS Rebinding Attacks", ACM CCS
// 2007) would count as same-origin and could read studies and post forms. The browser still
// sends that foreign name in the Host header, so a loopback server refuses every Host but a
// loopback one (OWASP ASVS 4.0.3, V4.2.2 and V14.5.2). IP literals cannot be rebound; names can.
// Bound to other addresses, an operator may list the names it is reached by (`allowedHosts`).
import { isIP } from 'node:net';
import type { MiddlewareHandler } from 'hono';
import type { AppEnv } from './types.js';

export interface HostPolicy {
  /** The server listens on loopback only. */
  readonly loopbackOnly: boolean;
  /** Extra host names (no port) accepted, e.g. the name a TLS proxy is reached by. */
  readonly allowedHosts?: readonly string[];
}

/** The host name of a Host header value without port or brackets, lower-cased; undefined if malformed. */
export function hostName(header: string): string | undefined {
  const value = header.trim();
  if (!value || /[\s/\\?#@]/.test(value)) return undefined;
  try {
    const name = new URL(`http://${value}/`).hostname.toLowerCase();
    return name.startsWith('[') && name.endsWith(']') ? name.slice(1, -1) : name;
  } catch {
    return undefined;
  }
}

function isLoopbackName(name: string): boolean {
  if (name === 'localhost') return true;
  if (isIP(name) === 4) return name.startsWith('127.');
  return name === '::1';
}

/** Normalise an allowed-hosts entry ("lab.example.org", "LAB.example.org:443", "[::1]"). */
export function normaliseAllowedHost(entry: string): string | undefined {
  return hostName(entry);
}

/** May a request that names this Host be answered? */
export function isAllowedHost(header: string | undefined, policy: HostPolicy): boolean {
  const allowed = (policy.allowedHosts ?? []).map(normaliseAllowedHost).filter((x): x is string => !!x);
  if (header === undefined) return !policy.loopbackOnly && allowed.length === 0;
  const name = hostName(header);
  if (!name) return false;
  if (allowed.includes(name)) return true;
  if (policy.loopbackOnly) return isLoopbackName(name);
  return allowed.length === 0;
}

/** Refuse requests addressed to a host name this server does not answer to (421, plain text). */
export function hostGuard(): MiddlewareHandler<AppEnv> {
  return async (c, next) => {
    const deps = c.get('deps');
    // node-server builds the request URL from the Host header (or the bound address when a
    // HTTP/1.0 client sends none), so the URL's host is the fallback.
    let header = c.req.header('Host');
    if (header === undefined) {
      try {
        header = new URL(c.req.url).host;
      } catch {
        header = undefined;
      }
    }
    if (isAllowedHost(header, { loopbackOnly: deps.loopbackOnly, allowedHosts: deps.allowedHosts })) return next();
    const message = deps.loopbackOnly
      ? 'Themata on this computer answers only to addresses of this computer. Open it at http://127.0.0.1 or http://localhost with its port. ' +
        'This request named another host and was refused, to keep other web sites away from your studies.'
      : 'This Themata server does not answer to that host name. Use the address its operator gave you; operators add names with the allowed hosts setting.';
    return c.text(message, 421);
  };
}
