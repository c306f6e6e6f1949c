// The planted covariate effects are visible in the planted mixtures: at the named level the
// theme's mean share is well above its share elsewhere, and the recorded summary agrees.
import { describe, expect, it } from 'vitest';
import { DEFAULT_ANSWERS, DEFAULT_SEED, THEME_IDS, generateDemo } from '../../demo/index.js';

const { rows, truth } = generateDemo({ answers: DEFAULT_ANSWERS, seed: DEFAULT_SEED });
const truthRows = truth.rows!;

function meanShares(covariate: string, level: string, theme: string): { at: number; elsewhere: number } {
  const k = THEME_IDS.indexOf(theme as (typeof THEME_IDS)[number]);
  let at = 0, nAt = 0, other = 0, nOther = 0;
  rows.forEach((r, i) => {
    const t = truthRows[i];
    if (t.kind !== 'answer') return;
    if (String(r[covariate as keyof typeof r]) === level) {
      at += t.mixture![k];
      nAt++;
    } else {
      other += t.mixture![k];
      nOther++;
    }
  });
  return { at: at / nAt, elsewhere: other / nOther };
}

describe('planted effects', () => {
  it('lists the five effects of the scenario with λ = ln(multiplier)', () => {
    expect(truth.effects.map((e) => `${e.covariate}=${e.level}→${e.theme}`)).toEqual([
      'branch_region=Ostrevale→access', 'channel=web→digital', 'age_band=16-29→quiet', 'age_band=30-44→children', 'wave=2026→hours',
    ]);
    for (const e of truth.effects) expect(e.lambda).toBeCloseTo(Math.log(e.multiplier), 4);
  });

  for (const e of generateDemo({ answers: 10, seed: 1 }).truth.effects) {
    it(`${e.covariate} ${e.level} writes at least twice as much about ${e.theme}`, () => {
      const m = meanShares(e.covariate, e.level, e.theme);
      expect(m.at / m.elsewhere).toBeGreaterThan(2);
      const recorded = truth.effects.find((x) => x.level === e.level && x.theme === e.theme)!;
      expect(recorded.meanShareAtLevel).toBeCloseTo(m.at, 3);
      expect(recorded.meanShareElsewhere).toBeCloseTo(m.elsewhere, 3);
    });
  }

  it('leaves unplanted pairs without a large difference (Ostrevale and events)', () => {
    const m = meanShares('branch_region', 'Ostrevale', 'events');
    expect(m.at / m.elsewhere).toBeLessThan(1.5);
    expect(m.at / m.elsewhere).toBeGreaterThan(0.5);
  });

  it('keeps mixtures sparse: most answers put over 80% of their mass on at most two themes', () => {
    const answers = truthRows.filter((t) => t.kind === 'answer');
    const sparse = answers.filter((t) => {
      const top = [...t.mixture!].sort((a, b) => b - a);
      return top[0] + top[1] > 0.8;
    });
    expect(sparse.length / answers.length).toBeGreaterThan(0.6);
  });
});
