// The committed demo files are exactly what the generator makes from the default seed, and the
// streaming writer writes the same bytes as the in-memory functions.
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { DEFAULT_ANSWERS, DEFAULT_SEED, DEMO_FILE_NAMES, demoCsv, demoTruthJson, demoXlsx, generateDemo } from '../../demo/index.js';
import { DEMO_DIR, writeDemoFiles } from '../../demo/generate.js';

const demo = generateDemo({ answers: DEFAULT_ANSWERS, seed: DEFAULT_SEED });

function firstDifference(a: Uint8Array, b: Uint8Array): string {
  const n = Math.min(a.length, b.length);
  for (let i = 0; i < n; i++) if (a[i] !== b[i]) return `first difference at byte ${i} (lengths ${a.length}, ${b.length})`;
  return a.length === b.length ? 'identical' : `lengths differ: ${a.length} vs ${b.length}`;
}

describe('committed demo files', () => {
  it('library-survey.csv is reproduced byte for byte from the default seed', () => {
    const committed = readFileSync(join(DEMO_DIR, DEMO_FILE_NAMES.csv));
    const made = Buffer.from(demoCsv(demo.rows), 'utf8');
    expect(firstDifference(made, committed)).toBe('identical');
  });

  it('truth.json is reproduced byte for byte from the default seed', () => {
    const committed = readFileSync(join(DEMO_DIR, DEMO_FILE_NAMES.truth));
    const made = Buffer.from(demoTruthJson(demo.truth), 'utf8');
    expect(firstDifference(made, committed)).toBe('identical');
  });

  it('library-survey.xlsx is reproduced byte for byte, whatever the clock says', async () => {
    const committed = readFileSync(join(DEMO_DIR, DEMO_FILE_NAMES.xlsx));
    const made = await demoXlsx(demo.rows);
    expect(firstDifference(made, committed)).toBe('identical');
  });

  it('starts with a UTF-8 byte-order mark and the documented header', () => {
    const text = demoCsv(demo.rows.slice(0, 1));
    expect(text.charCodeAt(0)).toBe(0xfeff);
    expect(text.slice(1).split('\r\n')[0]).toBe('answer_id,answer,questionnaire_language,link_key,branch_region,channel,age_band,wave,weight');
  });
});

describe('streaming writer', () => {
  it('writes the same CSV and truth as the in-memory generator', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'themata-demo-'));
    try {
      const options = { answers: 500, seed: 7 };
      await writeDemoFiles(dir, options, false);
      const small = generateDemo(options);
      expect(readFileSync(join(dir, DEMO_FILE_NAMES.csv), 'utf8')).toBe(demoCsv(small.rows));
      expect(readFileSync(join(dir, DEMO_FILE_NAMES.truth), 'utf8')).toBe(demoTruthJson(small.truth));
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });

  it('gives different data for a different seed', () => {
    const a = generateDemo({ answers: 50, seed: 1 }).rows.map((r) => r.answer);
    const b = generateDemo({ answers: 50, seed: 2 }).rows.map((r) => r.answer);
    expect(a).not.toEqual(b);
  });
});
