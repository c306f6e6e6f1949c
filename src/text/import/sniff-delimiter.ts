// Guess the delimiter of a delimited text file from its first records.
//
// For each candidate the sample is split into records and fields with RFC 4180 quoting
// ("Common Format and MIME Type for CSV Files", RFC 4180 (2005), section 2, rules 5–7: a field
// that starts with a double quote runs to the closing quote, which may enclose delimiters and
// line breaks; a doubled quote is a literal quote). The candidate whose records most often have
// as many fields as the header (and more than one) wins; ties go to the format's usual
// delimiter, then to more columns. Common practice; spreadsheet programs do much the same.

export const DELIMITER_CANDIDATES = [',', '\t', ';', '|'] as const;
export type Delimiter = (typeof DELIMITER_CANDIDATES)[number];

const SAMPLE_CHARS = 65_536;
const SAMPLE_RECORDS = 100;

/** Fields per record for the first records of `text`, split on `delimiter`. */
export function countFields(text: string, delimiter: string): number[] {
  const end = Math.min(text.length, SAMPLE_CHARS);
  const counts: number[] = [];
  let fields = 1;
  let fieldStart = true;
  let lineHasContent = false;
  let i = 0;
  while (i < end && counts.length < SAMPLE_RECORDS) {
    const c = text[i];
    if (fieldStart && c === '"') {
      // Quoted field: skip to the closing quote; "" is an escaped quote.
      i++;
      while (i < end) {
        if (text[i] === '"') {
          if (text[i + 1] === '"') i += 2;
          else break;
        } else i++;
      }
      if (i >= end) return counts; // sample ends inside a quoted field: drop the partial record
      i++;
      fieldStart = false;
      lineHasContent = true;
      continue;
    }
    if (c === delimiter) {
      fields++;
      fieldStart = true;
      lineHasContent = true;
    } else if (c === '\n' || c === '\r') {
      if (lineHasContent) counts.push(fields);
      fields = 1;
      fieldStart = true;
      lineHasContent = false;
      if (c === '\r' && text[i + 1] === '\n') i++;
    } else {
      fieldStart = false;
      lineHasContent = true;
    }
    i++;
  }
  if (lineHasContent && end === text.length && counts.length < SAMPLE_RECORDS) counts.push(fields);
  return counts;
}

/** The most likely delimiter; `preferred` wins ties (tab for .tsv files, comma otherwise). */
export function sniffDelimiter(text: string, preferred: Delimiter = ','): Delimiter {
  let best: Delimiter = preferred;
  let bestScore = -1;
  let bestWidth = 0;
  const ordered = [preferred, ...DELIMITER_CANDIDATES.filter((d) => d !== preferred)];
  for (const d of ordered) {
    const counts = countFields(text, d);
    if (counts.length === 0 || counts[0] < 2) continue;
    const width = counts[0];
    const consistent = counts.filter((n) => n === width).length / counts.length;
    const tie = Math.abs(consistent - bestScore) <= 1e-9;
    if (consistent > bestScore + 1e-9 || (tie && best !== preferred && width > bestWidth)) {
      best = d;
      bestScore = consistent;
      bestWidth = width;
    }
  }
  return best;
}
