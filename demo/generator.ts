// The seeded generator of the demo study (issue 3). Pure: returns rows and truth, never touches
// disk (generate.ts writes files). Generative story per answer, after DMR ("Topic Models
// Conditioned on Arbitrary Features with Dirichlet-multinomial Regression", UAI 2008):
// α_k = base_k · Π multipliers of the answer's covariate levels (= exp(λ·x)); θ ~ Dir(α);
// each sentence's theme ~ θ; the sentence is a theme template in the written language.
import { Xoshiro128 } from '../src/model/rng.js';
import type { Rng } from '../src/model/types.js';
import {
  AGE_BANDS, AGE_SHARES, AGE_WEIGHT, BASE_ALPHA, CHANNELS, CHANNEL_SHARES, CHANNEL_WEIGHT, EMOJI,
  NEUTRAL_NON_ANSWERS, PLANTED, RATES, REGIONS, REGION_LANGUAGES, REGION_SHARES, SENTENCE_COUNTS,
  THEME_NAMES, WAVES, WAVE_SHARES, WEIGHT_NOISE_SD,
} from './scenario.js';
import { addTypos, casual, drawSentence, joinSentences, renderSentence, stripAccents, type SentenceChoice } from './compose.js';
import { choose, dirichlet, normal, pick } from './sampling.js';
import { PHRASES } from './phrases/index.js';
import { keyWords } from './key-words.js';
import {
  DEMO_LANGUAGES, THEME_IDS, type DemoLanguage, type DemoRow, type DemoTruth, type EffectCheck, type RowTruth,
} from './types.js';

export const GENERATOR_NAME = 'Themata demo generator 1 (demo/generate.ts)';
export const DEFAULT_ANSWERS = 4000;
export const DEFAULT_SEED = 20251;
/** Above this many answers truth.json keeps only the summary (per-row detail would be huge). */
export const PER_ROW_TRUTH_LIMIT = 100_000;

export interface DemoOptions {
  answers: number;
  seed: number;
}

export interface DemoItem {
  row: DemoRow;
  truth: RowTruth;
}

interface Respondent {
  region: (typeof REGIONS)[number];
  channel: string;
  age: string;
  wave: string;
  weight: number;
}

const K = THEME_IDS.length;
const round4 = (x: number) => Math.round(x * 1e4) / 1e4;

function drawRespondent(rng: Rng): Respondent {
  const region = REGIONS[pick(rng, REGION_SHARES)];
  const channel = CHANNELS[pick(rng, CHANNEL_SHARES)];
  const age = AGE_BANDS[pick(rng, AGE_SHARES)];
  const wave = WAVES[pick(rng, WAVE_SHARES)];
  const raw = AGE_WEIGHT[age] * CHANNEL_WEIGHT[channel] * Math.exp(WEIGHT_NOISE_SD * normal(rng));
  return { region, channel, age, wave, weight: Math.max(0.05, Math.round(raw * 1000) / 1000) };
}

/** α for a respondent: baseline times every planted multiplier whose level matches. */
export function alphaFor(levels: Record<string, string>): number[] {
  const alpha = BASE_ALPHA.slice();
  for (const e of PLANTED) if (levels[e.covariate] === e.level) alpha[THEME_IDS.indexOf(e.theme)] *= e.multiplier;
  return alpha;
}

function otherLanguage(rng: Rng, not: DemoLanguage, regionMix: number[]): DemoLanguage {
  const probs = regionMix.map((p, i) => (DEMO_LANGUAGES[i] === not ? 0 : p + 0.05));
  return DEMO_LANGUAGES[pick(rng, probs)];
}

/** Whether two choices render to the same sentence in `language` (same template, and same filler if it has a slot). */
function sameSentence(a: SentenceChoice, b: SentenceChoice, language: DemoLanguage): boolean {
  if (a.theme !== b.theme) return false;
  const phrases = PHRASES[language].themes[THEME_IDS[a.theme]];
  const n = phrases.templates.length;
  if (a.template % n !== b.template % n) return false;
  const m = phrases.fillers.length;
  return !phrases.templates[a.template % n].includes('{x}') || a.filler % m === b.filler % m;
}

function sentenceCounts(choices: SentenceChoice[]): number[] {
  const counts = new Array<number>(K).fill(0);
  for (const c of choices) counts[c.theme]++;
  return counts;
}

function themesOf(counts: number[]): (typeof THEME_IDS)[number][] {
  const present: number[] = [];
  for (let k = 0; k < K; k++) if (counts[k] > 0) present.push(k);
  if (present.length > 1) present.sort((a, b) => counts[b] - counts[a] || a - b);
  return present.map((k) => THEME_IDS[k]);
}

/** Rows one at a time, so a million answers stream without being held in memory. */
export function* demoItems(options: DemoOptions): Generator<DemoItem> {
  let produced = 0;
  let links = 0;
  let respondent = 0;
  const id = () => `A${String(produced + 1).padStart(7, '0')}`;
  while (produced < options.answers) {
    // One random stream per respondent: editing a phrase changes only the answers that use it,
    // not every answer after it.
    const rng = Xoshiro128.fromSeed(options.seed, respondent++);
    const who = drawRespondent(rng);
    const mix = REGION_LANGUAGES[who.region];
    const written = DEMO_LANGUAGES[pick(rng, mix)];
    const declared = rng.nextDouble() < RATES.declaredMismatch ? otherLanguage(rng, written, mix) : written;
    const base = {
      branch_region: who.region, channel: who.channel, age_band: who.age, wave: who.wave, weight: who.weight,
    };
    const answerId = id();

    if (rng.nextDouble() < RATES.nonAnswer) {
      const useNeutral = rng.nextDouble() < 0.35;
      const text = useNeutral ? choose(rng, NEUTRAL_NON_ANSWERS) : choose(rng, PHRASES[written].nonAnswers);
      const neutral = NEUTRAL_NON_ANSWERS.includes(text);
      produced++;
      yield {
        row: { answer_id: answerId, answer: text, questionnaire_language: declared, link_key: '', ...base },
        truth: {
          answer_id: answerId, kind: 'non-answer', language: neutral ? null : written, themes: [],
          sentences: new Array<number>(K).fill(0), mixture: null, ...(declared !== written ? { declaredMismatch: true as const } : {}),
        },
      };
      continue;
    }

    const theta = dirichlet(rng, alphaFor({ branch_region: who.region, channel: who.channel, age_band: who.age, wave: who.wave }));
    const long = rng.nextDouble() < RATES.long;
    const mixed = !long && rng.nextDouble() < RATES.mixed;
    let n = long ? 8 + rng.nextInt(7) : 1 + pick(rng, SENTENCE_COUNTS);
    if (mixed) n = 4;
    const choices: SentenceChoice[] = [];
    for (let i = 0; i < n; i++) {
      // Nobody writes the same sentence twice in one answer: redraw a repeat (a few tries).
      let c = drawSentence(rng, pick(rng, theta));
      for (let tries = 0; tries < 4 && choices.some((p) => sameSentence(p, c, written)); tries++) c = drawSentence(rng, c.theme);
      choices.push(c);
    }

    const second = mixed ? otherLanguage(rng, written, mix) : null;
    const sentences = choices.map((c, i) => renderSentence(c, second !== null && i === n - 1 ? second : written));
    let text = joinSentences(rng, sentences, written, long);
    const truth: RowTruth = {
      answer_id: answerId, kind: 'answer', language: written, themes: [], sentences: sentenceCounts(choices),
      mixture: theta.map(round4),
    };
    truth.themes = themesOf(truth.sentences);
    if (second) truth.mixedWith = second;
    if (declared !== written) truth.declaredMismatch = true;
    if (long) truth.long = true;
    if (written !== 'ja') {
      if (rng.nextDouble() < RATES.typoAnswer) {
        const typed = addTypos(rng, text, RATES.typoWord);
        if (typed !== text) truth.typos = true;
        text = typed;
      }
      if (written !== 'en' && rng.nextDouble() < RATES.noAccents) text = stripAccents(text);
      if (!long && rng.nextDouble() < RATES.lowerCase) text = casual(text);
    }
    if (rng.nextDouble() < RATES.emoji) {
      text = rng.nextDouble() < 0.5 ? `${text} ${choose(rng, EMOJI)}` : `${choose(rng, EMOJI)} ${text}`;
      truth.emoji = true;
    }
    const wantsTranslation = rng.nextDouble() < RATES.translation && produced + 2 <= options.answers;
    const linkKey = wantsTranslation ? `L${String(++links).padStart(6, '0')}` : '';
    produced++;
    yield { row: { answer_id: answerId, answer: text, questionnaire_language: declared, link_key: linkKey, ...base }, truth };

    if (wantsTranslation) {
      // A translation made for the network's report: clean text, same respondent, same θ.
      const target = written === 'en' || rng.nextDouble() < 0.4 ? otherLanguage(rng, written, mix) : 'en';
      const translated = joinSentences(rng, choices.map((c) => renderSentence(c, target)), target, long);
      const tid = id();
      produced++;
      yield {
        row: { answer_id: tid, answer: translated, questionnaire_language: target, link_key: linkKey, ...base },
        truth: {
          answer_id: tid, kind: 'translation', language: target, themes: truth.themes, sentences: truth.sentences,
          mixture: truth.mixture, translationOf: answerId, ...(long ? { long: true as const } : {}),
        },
      };
    }
  }
}

const PLANTED_THEME = PLANTED.map((e) => THEME_IDS.indexOf(e.theme));
const LANGUAGE_KEYS: Record<string, string> = Object.fromEntries([...DEMO_LANGUAGES, 'none'].map((l) => [l, `language:${l}`]));

/** Running summary of planted effects and counts, so huge sizes need not keep rows. */
export class TruthSummary {
  private readonly sums = PLANTED.map(() => ({ atSum: 0, atN: 0, elseSum: 0, elseN: 0 }));
  readonly counts: Record<string, number> = { rows: 0, answers: 0, translations: 0, nonAnswers: 0, mixed: 0, long: 0, emoji: 0, declaredMismatch: 0, typos: 0 };

  add(item: DemoItem): void {
    const { row, truth } = item;
    const c = this.counts;
    c.rows++;
    if (truth.kind === 'answer') c.answers++;
    else if (truth.kind === 'translation') c.translations++;
    else c.nonAnswers++;
    if (truth.mixedWith) c.mixed++;
    if (truth.long && truth.kind === 'answer') c.long++;
    if (truth.emoji) c.emoji++;
    if (truth.declaredMismatch) c.declaredMismatch++;
    if (truth.typos) c.typos++;
    const lang = LANGUAGE_KEYS[truth.language ?? 'none'];
    c[lang] = (c[lang] ?? 0) + 1;
    // Effects are measured on original answers only: a translation repeats its group's θ.
    if (truth.kind !== 'answer' || truth.mixture === null) return;
    for (let i = 0; i < PLANTED.length; i++) {
      const e = PLANTED[i];
      const share = truth.mixture[PLANTED_THEME[i]];
      const s = this.sums[i];
      if (row[e.covariate] === e.level) {
        s.atSum += share;
        s.atN++;
      } else {
        s.elseSum += share;
        s.elseN++;
      }
    }
  }

  effects(): EffectCheck[] {
    return PLANTED.map((e, i) => {
      const s = this.sums[i];
      return {
        ...e, lambda: round4(Math.log(e.multiplier)),
        meanShareAtLevel: round4(s.atSum / Math.max(1, s.atN)), meanShareElsewhere: round4(s.elseSum / Math.max(1, s.elseN)),
      };
    });
  }
}

/** The truth document without per-row detail. */
export function truthHead(options: DemoOptions, summary: TruthSummary): Omit<DemoTruth, 'rows'> {
  const words = keyWords();
  return {
    generator: GENERATOR_NAME,
    seed: options.seed,
    answers: options.answers,
    languages: DEMO_LANGUAGES,
    themes: THEME_IDS.map((id) => ({ id, name: THEME_NAMES[id], keyWords: words[id] })),
    baseAlpha: BASE_ALPHA.slice(),
    effects: summary.effects(),
    counts: summary.counts,
  };
}

/** The whole demo in memory (fine up to a few hundred thousand answers). */
export function generateDemo(options: DemoOptions): { rows: DemoRow[]; truth: DemoTruth } {
  const rows: DemoRow[] = [];
  const truthRows: RowTruth[] = [];
  const summary = new TruthSummary();
  for (const item of demoItems(options)) {
    rows.push(item.row);
    truthRows.push(item.truth);
    summary.add(item);
  }
  return { rows, truth: { ...truthHead(options, summary), rows: options.answers <= PER_ROW_TRUTH_LIMIT ? truthRows : null } };
}
