// Reading form fields into plain values, with messages a researcher can act on.
import { normalizeLanguageTag } from '../../text/index.js';

type Field = string | File | (string | File)[] | undefined;

export function text(field: Field): string {
  return typeof field === 'string' ? field : Array.isArray(field) && typeof field[0] === 'string' ? field[0] : '';
}

export function texts(field: Field): string[] {
  if (field === undefined) return [];
  const all = Array.isArray(field) ? field : [field];
  return all.filter((v): v is string => typeof v === 'string' && v !== '');
}

/** "en, es; fr" → ['en','es','fr'], or an error message. */
export function parseLanguageList(field: Field): string[] | string {
  const raw = text(field)
    .split(/[\s,;]+/)
    .map((s) => s.trim())
    .filter(Boolean);
  const out: string[] = [];
  for (const tag of raw) {
    const norm = normalizeLanguageTag(tag);
    if (!norm) return `"${tag}" is not a language Themata recognises. Use codes such as en, es, fr, de, zh.`;
    if (!out.includes(norm)) out.push(norm);
  }
  return out;
}

/** An integer in [min, max], or an error message naming the field. */
export function intField(field: Field, label: string, min: number, max: number, fallback?: number): number | string {
  const raw = text(field).trim();
  if (raw === '' && fallback !== undefined) return fallback;
  const n = Number(raw);
  if (!Number.isInteger(n) || n < min || n > max) return `${label} must be a whole number from ${min} to ${max}.`;
  return n;
}

export function numberField(field: Field, label: string, min: number, max: number, fallback?: number): number | string {
  const raw = text(field).trim();
  if (raw === '' && fallback !== undefined) return fallback;
  const n = Number(raw);
  if (!Number.isFinite(n) || n < min || n > max) return `${label} must be a number from ${min} to ${max}.`;
  return n;
}

export function queryInt(raw: string | undefined, fallback: number, min = 0, max = Number.MAX_SAFE_INTEGER): number {
  const n = Number(raw);
  return Number.isInteger(n) && n >= min && n <= max ? n : fallback;
}
