// The Themes table's plain rows: share, top words per language, language balance, and from the
// run's stored checks its coherence, stability and alignment across languages.
import type { AlignmentStatus } from '../../eval/index.js';
import type { RunChecks } from '../../services/index.js';
import type { RunData } from './run-data.js';
import type { ThemeName } from './theme-names.js';

const WORDS_IN_TABLE = 8;

export interface ThemeRowData {
  readonly k: number;
  readonly name: ThemeName;
  readonly share: number;
  readonly words: Record<string, string[]>;
  readonly balance: { language: string; share: number }[];
  readonly coherence?: number;
  readonly stability?: number;
  /** From held-out translations if there are any, else from glossary rows. */
  readonly alignment?: { status: AlignmentStatus; source: 'translations' | 'glossary' };
}

export function themeRows(data: RunData, names: readonly ThemeName[], checks: RunChecks | undefined): ThemeRowData[] {
  const { model } = data;
  const L = model.languages.length;
  const coherence = new Map<number, number[]>();
  for (const t of checks?.coherence.themes ?? []) if (Number.isFinite(t.npmi)) (coherence.get(t.theme) ?? coherence.set(t.theme, []).get(t.theme)!).push(t.npmi);
  const held = checks?.themeAlignment?.heldOut ?? null;
  const glossary = checks?.themeAlignment?.glossary ?? null;
  return names.map((name, k) => {
    const c = coherence.get(k);
    const heldStatus = held?.themes[k]?.status;
    const alignment = heldStatus && heldStatus !== 'too few pairs'
      ? { status: heldStatus, source: 'translations' as const }
      : glossary?.themes[k] && glossary.themes[k].status !== 'too few pairs'
        ? { status: glossary.themes[k].status, source: 'glossary' as const }
        : undefined;
    return {
      k,
      name,
      share: data.shares[k],
      words: Object.fromEntries(model.languages.map((l) => [l, data.topWords(k, l, WORDS_IN_TABLE).map((w) => w.word)])),
      balance: model.languages.map((language, l) => ({ language, share: data.balance[k * L + l] })),
      coherence: c ? c.reduce((a, b) => a + b, 0) / c.length : undefined,
      stability: checks?.stability?.perTheme[k],
      alignment,
    };
  });
}
