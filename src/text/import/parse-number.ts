// Cell text → number, for weights and numeric covariates.
//
// Accepts plain decimal numbers with a dot ("3", "-0.25", "1e-3", ".5") and, because European
// spreadsheet exports write them so, a decimal comma ("0,75"). A comma followed by exactly three
// digits ("25,000") is refused as ambiguous: it may be a thousands separator (25000) or a decimal
// comma (25.0), and guessing wrong would silently change the data. Common practice.

export type ParsedNumber =
  | { readonly ok: true; readonly value: number }
  | { readonly ok: false; readonly reason: string };

const DOT_NUMBER = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;
const COMMA_NUMBER = /^[+-]?\d+,\d+$/;

export function parseNumber(cell: string): ParsedNumber {
  const s = cell.trim();
  if (DOT_NUMBER.test(s)) {
    const value = Number(s);
    return Number.isFinite(value) ? { ok: true, value } : { ok: false, reason: 'is too large to be a number' };
  }
  if (COMMA_NUMBER.test(s)) {
    const decimals = s.length - s.indexOf(',') - 1;
    if (decimals === 3) {
      return {
        ok: false,
        reason: 'is ambiguous (a thousands separator or a decimal comma?); write it without the comma or with a dot',
      };
    }
    return { ok: true, value: Number(s.replace(',', '.')) };
  }
  return { ok: false, reason: 'is not a number' };
}

/** True when the cell reads as a number (used by column type suggestions). */
export function looksNumeric(cell: string): boolean {
  return parseNumber(cell).ok;
}
