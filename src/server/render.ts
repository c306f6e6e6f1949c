// hono's c.html() writes no doctype; every full page goes through here.
import type { Context } from 'hono';
import type { ContentfulStatusCode } from 'hono/utils/http-status';
import type { JSX } from 'hono/jsx/jsx-runtime';

export async function renderPage(c: Context, node: JSX.Element, status: ContentfulStatusCode = 200): Promise<Response> {
  const html = await node.toString();
  return c.html(`<!DOCTYPE html>${html}`, status);
}

/** A fragment for htmx swaps (no doctype). */
export async function renderFragment(c: Context, node: JSX.Element, status: ContentfulStatusCode = 200): Promise<Response> {
  return c.html(await node.toString(), status);
}
