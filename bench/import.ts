// `npm run bench -- --only import [--quick] [--json]` (issue 2, "Figures"): answers per second of
// the text pipeline on generated short answers in five languages — language identification,
// tokenization + stemming, and prepareText (tokens, stop words, stems, pruning, vocabularies) —
// and the extrapolated pipeline time for one million 20-word answers. Pipeline only: reading
// files and writing SQLite are measured by the store's own benchmark.
//
// The answers are invented by a seeded generator below (function words and survey-like content
// words per language, shuffled); they exercise the same code paths as real answers, not their
// language-identification difficulty (the UDHR test measures accuracy).
import { Xoshiro128 } from '../src/model/rng.js';
import { identifyLanguages } from '../src/text/language/index.js';
import { scanTokens, stemmerFor, stopWordSet } from '../src/text/tokens/index.js';
import { defaultPipelineSettings, prepareText } from '../src/text/vocabulary/index.js';
import type { BenchOptions } from './run.js';

const WORDS: Record<string, { glue: string[]; content: string[] }> = {
  en: {
    glue: ['the', 'and', 'was', 'to', 'of', 'very', 'is', 'not', 'for', 'with', 'it', 'my'],
    content: ['library', 'opening', 'hours', 'staff', 'friendly', 'books', 'waiting', 'parking', 'children', 'quiet', 'computers', 'loans', 'events', 'study', 'rooms', 'online', 'catalogue', 'helpful', 'crowded', 'noisy', 'reading', 'weekend', 'evening', 'closed'],
  },
  es: {
    glue: ['el', 'la', 'y', 'de', 'que', 'muy', 'es', 'no', 'para', 'con', 'los', 'mi'],
    content: ['biblioteca', 'horario', 'personal', 'amable', 'libros', 'espera', 'aparcamiento', 'niños', 'tranquila', 'ordenadores', 'préstamos', 'eventos', 'estudio', 'salas', 'catálogo', 'ruidosa', 'lectura', 'cerrada', 'fines', 'semana', 'tarde', 'ayuda', 'llena', 'servicio'],
  },
  fr: {
    glue: ['le', 'la', 'et', 'de', 'que', 'très', 'est', 'pas', 'pour', 'avec', 'les', 'mon'],
    content: ['bibliothèque', 'horaires', 'personnel', 'aimable', 'livres', 'attente', 'stationnement', 'enfants', 'calme', 'ordinateurs', 'prêts', 'événements', 'étude', 'salles', 'catalogue', 'bruyante', 'lecture', 'fermée', 'weekend', 'soirée', 'accueil', 'pleine', 'service', 'emprunts'],
  },
  de: {
    glue: ['der', 'die', 'und', 'ist', 'nicht', 'sehr', 'mit', 'für', 'das', 'ein', 'zu', 'mein'],
    content: ['bibliothek', 'öffnungszeiten', 'personal', 'freundlich', 'bücher', 'wartezeit', 'parkplatz', 'kinder', 'ruhig', 'computer', 'ausleihe', 'veranstaltungen', 'lernen', 'räume', 'katalog', 'laut', 'lesesaal', 'geschlossen', 'wochenende', 'abends', 'hilfsbereit', 'voll', 'service', 'zeitschriften'],
  },
  pt: {
    glue: ['o', 'a', 'e', 'de', 'que', 'muito', 'é', 'não', 'para', 'com', 'os', 'meu'],
    content: ['biblioteca', 'horário', 'funcionários', 'simpáticos', 'livros', 'espera', 'estacionamento', 'crianças', 'tranquila', 'computadores', 'empréstimos', 'eventos', 'estudo', 'salas', 'catálogo', 'barulhenta', 'leitura', 'fechada', 'fim', 'semana', 'noite', 'atendimento', 'cheia', 'serviço'],
  },
};
const LANGUAGES = Object.keys(WORDS);

function generate(count: number, minWords: number, maxWords: number, seed: number): { text: string; language: string }[] {
  const rng = Xoshiro128.fromSeed(seed);
  const out: { text: string; language: string }[] = [];
  for (let i = 0; i < count; i++) {
    const language = LANGUAGES[rng.nextInt(LANGUAGES.length)];
    const { glue, content } = WORDS[language];
    const length = minWords + rng.nextInt(maxWords - minWords + 1);
    const words: string[] = [];
    for (let w = 0; w < length; w++) words.push(rng.nextDouble() < 0.4 ? glue[rng.nextInt(glue.length)] : content[rng.nextInt(content.length)]);
    words[0] = words[0][0].toUpperCase() + words[0].slice(1);
    out.push({ text: `${words.join(' ')}${rng.nextDouble() < 0.5 ? '.' : ''}`, language });
  }
  return out;
}

function perSecond(count: number, ms: number): number {
  return Math.round((count / ms) * 1000);
}

/**
 * Milliseconds of CPU time this process spent in `work`. The pipeline runs on one thread, so on
 * an idle machine this equals wall time; on a shared machine it is the figure that does not
 * depend on what else is running (wall time is printed beside it).
 */
function cpuMs<T>(work: () => T): { result: T; ms: number; wallMs: number } {
  const c0 = process.cpuUsage();
  const t0 = performance.now();
  const result = work();
  const c = process.cpuUsage(c0);
  return { result, ms: (c.user + c.system) / 1000, wallMs: performance.now() - t0 };
}

export async function runBench(options: BenchOptions): Promise<Record<string, unknown>> {
  const { log } = options;
  const n = options.quick ? 20_000 : 100_000;
  const short = generate(n, 3, 15, 20260502);
  const texts = short.map((a) => a.text);
  log(`pipeline only (no file reading, no SQLite): ${n} generated answers of 3–15 words in ${LANGUAGES.join(', ')}`);

  // Warm up caches and JIT on a small slice, as a long import would be warm.
  identifyLanguages(texts.slice(0, 2000), { languages: LANGUAGES });
  prepareText(short.slice(0, 2000), defaultPipelineSettings());

  const identify = cpuMs(() => identifyLanguages(texts, { languages: LANGUAGES }));
  const decisions = identify.result;
  const identifyMs = identify.ms;
  const correct = decisions.filter((d, i) => d.language === short[i].language).length;
  log(
    `language identification: ${perSecond(n, identifyMs)} answers/s CPU time (${perSecond(n, identify.wallMs)} wall); agreement with generator labels ${(correct / n).toFixed(4)}`,
  );

  const settings = defaultPipelineSettings();
  const stemmers = new Map(LANGUAGES.map((l) => [l, stemmerFor(l, settings)]));
  const stops = new Map(LANGUAGES.map((l) => [l, stopWordSet(l)]));
  let tokens = 0;
  const tokenize = cpuMs(() => {
    for (const answer of short) {
      const stem = stemmers.get(answer.language) as (w: string) => string;
      const stop = stops.get(answer.language) as Set<string>;
      scanTokens(answer.text, answer.language, (kind, _surface, normal) => {
        if (kind === 'word' && !stop.has(normal)) {
          stem(normal);
          tokens++;
        }
      });
    }
  });
  const tokenizeMs = tokenize.ms;
  log(
    `tokenize + stop words + stem: ${perSecond(n, tokenizeMs)} answers/s CPU time (${perSecond(n, tokenize.wallMs)} wall), ${perSecond(tokens, tokenizeMs)} kept tokens/s; goal ≥ 50,000 answers/s`,
  );

  const prepare = cpuMs(() => prepareText(short.map((a, i) => ({ text: a.text, language: decisions[i].language })), settings));
  const prepareMs = prepare.ms;
  log(
    `prepareText (non-answers, tokens, stems, pruning, token arrays): ${perSecond(n, prepareMs)} answers/s CPU time (${perSecond(n, prepare.wallMs)} wall), ${prepare.result.vocabularies.length} vocabularies`,
  );

  // One million 20-word answers, extrapolated from a sample of 20-word answers.
  const m = options.quick ? 10_000 : 50_000;
  const long = generate(m, 20, 20, 20260503);
  identifyLanguages(long.slice(0, 1000).map((a) => a.text), { languages: LANGUAGES });
  // At a million answers trigram detection runs on 20,000 of them (2%); the sample keeps that
  // share so its per-answer cost is the million's.
  const sampleTrigramDocs = Math.max(1, Math.round((20_000 * m) / 1_000_000));
  const longIdentify = cpuMs(() =>
    identifyLanguages(long.map((a) => a.text), { languages: LANGUAGES, maxTrigramDocuments: sampleTrigramDocs }),
  );
  const longIdentifyMs = longIdentify.ms;
  const longPrepareMs = cpuMs(() => prepareText(long.map((a, i) => ({ text: a.text, language: longIdentify.result[i].language })), settings)).ms;
  const millionSeconds = ((longIdentifyMs + longPrepareMs) / m) * 1_000_000 / 1000;
  log(
    `one million 20-word answers (extrapolated from ${m}, trigram detection on ${sampleTrigramDocs} of them as at a million): language ${((longIdentifyMs / m) * 1000).toFixed(0)} s + tokens/vocabulary ${((longPrepareMs / m) * 1000).toFixed(0)} s = ${millionSeconds.toFixed(0)} s pipeline-only, CPU time on one core`,
  );

  let millionMeasured: number | undefined;
  if (options.full) {
    // --full: the million-answer case end to end (pipeline only), not extrapolated.
    const million = generate(1_000_000, 20, 20, 20260504);
    const ids = cpuMs(() => identifyLanguages(million.map((a) => a.text), { languages: LANGUAGES }));
    const prep = cpuMs(() => prepareText(million.map((a, i) => ({ text: a.text, language: ids.result[i].language })), settings));
    millionMeasured = (ids.ms + prep.ms) / 1000;
    log(
      `one million 20-word answers (measured): language ${(ids.ms / 1000).toFixed(0)} s + tokens/vocabulary ${(prep.ms / 1000).toFixed(0)} s = ${millionMeasured.toFixed(0)} s CPU time (${((ids.wallMs + prep.wallMs) / 1000).toFixed(0)} s wall)`,
    );
  }

  return {
    answers: n,
    million20WordSecondsMeasured: millionMeasured === undefined ? null : Math.round(millionMeasured),
    identifyPerSecond: perSecond(n, identifyMs),
    identifyAgreement: correct / n,
    tokenizeStemPerSecond: perSecond(n, tokenizeMs),
    prepareTextPerSecond: perSecond(n, prepareMs),
    million20WordSecondsPipelineOnly: Math.round(millionSeconds),
  };
}
