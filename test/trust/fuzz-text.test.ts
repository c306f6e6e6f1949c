// Issue 8, item 4: property-based checks (fast-check) of the hostile-input cases the text tests
// do not already cover. The tokenizer gets control characters, bidirectional overrides, zero-width
// characters, piles of combining marks, lone surrogates, unknown language tags and every option;
// the workbench's column mapper (column roles → ColumnMapping → documents) gets random tables with
// hostile, duplicate and empty column names and random role choices. Either a result or a clear
// message (a string or an InputError), never a crash; results keep their promises.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { mappingFromRoles, profileColumns, ROLE_LABELS, type ColumnRole } from '../../src/server/column-roles.js';
import { mapColumns, suggestColumnTypes } from '../../src/text/import/index.js';
import { tokenize } from '../../src/text/tokens/index.js';
import { InputError, type Table } from '../../src/text/types.js';

// U+202E RIGHT-TO-LEFT OVERRIDE, U+2066–2069 isolates, U+200B/200D zero-width, U+FEFF, U+0301
// combining acute, U+0000 and other C0/C1 controls, lone surrogates, and ordinary letters of
// several scripts.
const HOSTILE = ['\u202e', '\u202d', '\u2066', '\u2069', '\u200b', '\u200d', '\ufeff', '\u0301', '\u0000', '\u0007', '\u001b', '\u0085', '\u2028', '\ud800', '\udfff', '\t', '\r', '\n', ' '];
const LETTERS = ['a', 'Z', 'é', 'ß', 'İ', 'ı', 'Ж', 'ω', 'ب', 'א', '中', '日', 'ก', '🐴', '1', '.', "'", '’', '@', '/', ':', '<', '>', '"', '&'];
const hostileText = fc.oneof(
  fc.array(fc.constantFrom(...HOSTILE, ...LETTERS), { maxLength: 80 }).map((a) => a.join('')),
  fc.string({ unit: 'binary', maxLength: 80 }),
  fc.constantFrom('https://example.org/a?b=<c>', 'mail@example.org', '<script>alert(1)</script>', '=HYPERLINK("x")', 'l\u2019\u00e9t\u00e9', 'e\u0301'.repeat(300)),
);
const LANGUAGES = ['en', 'fr', 'tr', 'az', 'de', 'es', 'ru', 'ar', 'he', 'zh', 'zh-Hant', 'ja', 'th', 'km', 'lo', 'my', 'xx', 'und', '', 'EN_us'];

describe('tokenizer under hostile text', () => {
  it('never throws, is deterministic, keeps only the kinds asked for, and words have no white space', () => {
    const options = fc.record({ keepNumbers: fc.boolean(), keepUrls: fc.boolean(), keepEmails: fc.boolean(), keepEmoji: fc.boolean(), keepPunctuation: fc.boolean() });
    fc.assert(
      fc.property(hostileText, fc.constantFrom(...LANGUAGES), options, (text, language, opts) => {
        const tokens = tokenize(text, language, opts);
        expect(tokenize(text, language, opts)).toEqual(tokens);
        const allowed = new Set(['word', 'clitic', 'mention', 'symbol']);
        if (opts.keepNumbers) allowed.add('number');
        if (opts.keepUrls) allowed.add('url');
        if (opts.keepEmails) allowed.add('email');
        if (opts.keepEmoji) allowed.add('emoji');
        if (opts.keepPunctuation) allowed.add('punctuation');
        for (const t of tokens) {
          expect(allowed, `${t.kind} "${t.surface}"`).toContain(t.kind);
          expect(t.surface.length).toBeGreaterThan(0);
          expect(t.normal.length).toBeGreaterThan(0);
          if (t.kind === 'word') expect(t.normal).not.toMatch(/[\s\ufeff]/u);
        }
      }),
      { numRuns: 400 },
    );
  });

  // A byte-order mark in the middle of a text (files concatenated) must not give a word an
  // invisible twin in the vocabulary, on the Intl.Segmenter path too (Unicode
  // DerivedCoreProperties.txt: U+FEFF is Default_Ignorable_Code_Point).
  it('words never keep U+FEFF (zero width no-break space), on the Intl.Segmenter path too', () => {
    for (const language of ['ja', 'zh', 'th', 'en', 'de']) {
      const text = language === 'th' ? 'ห้องสมุด\ufeffเงียบ' : language === 'en' || language === 'de' ? 'library\ufeffhours quiet' : '東京\ufeff大学';
      for (const t of tokenize(text, language)) expect(t.surface).not.toContain('\ufeff');
    }
    expect(tokenize('東京\ufeff大学', 'ja').map((t) => t.normal)).toEqual(['東京', '大学']);
  });

  it('drops URLs and e-mail addresses by default however they are wrapped', () => {
    fc.assert(
      fc.property(fc.constantFrom(...HOSTILE.filter((c) => /\s/u.test(c) || c === '\u200b')), fc.constantFrom('en', 'fr', 'de'), (gap, language) => {
        const tokens = tokenize(`see${gap}https://example.org/path${gap}or${gap}mail@example.org${gap}now`, language);
        expect(tokens.map((t) => t.normal).join(' ')).not.toMatch(/example|https|mail@/);
      }),
      { numRuns: 50 },
    );
  });
});

const columnName = fc.oneof(
  fc.constantFrom('answer', 'id', 'lang', 'language', 'weight', 'region', '', ' ', 'answer', '<b>x</b>', '=cmd', '../x', 'a"b', 'Ñandú', '\u202eevil'),
  fc.string({ unit: 'binary', maxLength: 8 }),
);
const cell = fc.oneof(
  fc.constantFrom('', ' ', 'en', 'es', 'fr-CA', 'xx', '0', '-1', '2.5', '1,5', 'NaN', 'Infinity', '1e400', 'North', 'South'),
  hostileText,
);
const tableAndRoles = fc.integer({ min: 1, max: 5 }).chain((width) =>
  fc.record({
    columns: fc.array(columnName, { minLength: width, maxLength: width }),
    rows: fc.array(fc.array(cell, { minLength: width, maxLength: width }), { minLength: 1, maxLength: 8 }),
    roles: fc.array(fc.constantFrom(...(Object.keys(ROLE_LABELS) as ColumnRole[])), { minLength: width, maxLength: width }),
  }),
);

describe('column mapper under hostile tables', () => {
  it('profiles and suggests a role for every column without throwing', () => {
    fc.assert(
      fc.property(tableAndRoles, ({ columns, rows }) => {
        const table: Table = { fileName: 'f.csv', format: 'csv', columns, rows, assumed: { encoding: 'UTF-8' } };
        const profiles = profileColumns(table);
        expect(profiles).toHaveLength(columns.length);
        for (const p of profiles) expect(Object.keys(ROLE_LABELS)).toContain(p.role);
        expect(suggestColumnTypes(table)).toHaveLength(columns.length);
      }),
      { numRuns: 300 },
    );
  });

  it('turns any choice of roles into a mapping of existing columns or a message, and any mapping into documents or an InputError', () => {
    fc.assert(
      fc.property(tableAndRoles, ({ columns, rows, roles }) => {
        const table: Table = { fileName: 'f.csv', format: 'csv', columns, rows, assumed: { encoding: 'UTF-8' } };
        const mapping = mappingFromRoles(columns, roles);
        if (typeof mapping === 'string') {
          expect(mapping.length).toBeGreaterThan(0);
          return;
        }
        expect(mapping.text.length).toBeGreaterThan(0);
        const used = [...mapping.text, ...mapping.covariates.map((c) => c.column), mapping.id, mapping.language, mapping.link, mapping.weight].filter((c) => c !== undefined);
        for (const c of used) expect(columns).toContain(c);
        try {
          const docs = mapColumns(table, mapping, { languages: ['en', 'es', 'fr'] });
          for (const d of docs) {
            expect(d.text.trim().length).toBeGreaterThan(0);
            expect(Number.isFinite(d.weight) && d.weight > 0).toBe(true);
            expect(mapping.text).toContain(d.question);
          }
        } catch (error) {
          if (!(error instanceof InputError)) throw error;
          expect(error.message.length).toBeGreaterThan(0);
        }
      }),
      { numRuns: 500 },
    );
  });
});
