// Answers: read what people wrote, filtered by language, group and dominant theme, each answer
// with its theme mix. The filter form is posted, so search words stay out of addresses (OWASP
// ASVS 4.0.3 V8.3.1); filters without free text also work as links (?language=…&theme=…).
import { ShareStrip } from '../charts/index.js';
import { Cautions, count, Pager, percent } from '../components.js';
import { CsrfField, Layout, type PageFrame } from '../layout.js';
import { PostPager } from '../post-pager.js';

export interface AnswerView {
  readonly rowId: string;
  readonly language: string;
  readonly question: string;
  readonly text: string;
  readonly covariates: string;
  readonly mix: { k: number; label: string; share: number }[];
}

export function AnswersPage(props: {
  frame: PageFrame;
  base: string;
  languages: string[];
  labels: string[];
  covariates: { name: string; values: string[] }[];
  filter: { language: string; by: string; level: string; theme: string; q: string };
  answers: readonly AnswerView[];
  total: number;
  offset: number;
  limit: number;
}) {
  const f = props.filter;
  return (
    <Layout {...props.frame}>
      <h1>Answers</h1>
      <Cautions privacy />
      <form method="post" action={`${props.base}/answers`} class="row filters" id="answer-filters">
        <CsrfField csrf={props.frame.csrf} />
        <label>
          Language
          <select name="language">
            <option value="">any</option>
            {props.languages.map((l) => <option value={l} selected={l === f.language}>{l}</option>)}
          </select>
        </label>
        <label>
          Main theme
          <select name="theme">
            <option value="">any</option>
            {props.labels.map((l, k) => <option value={String(k)} selected={String(k) === f.theme}>{`${k + 1}. ${l}`}</option>)}
          </select>
        </label>
        <label>
          Group
          <select name="group">
            <option value="">any</option>
            {props.covariates.flatMap((c) => c.values.map((v) => {
              const value = `${c.name}=${v}`;
              return <option value={value} selected={f.by === c.name && f.level === v}>{`${c.name}: ${v}`}</option>;
            }))}
          </select>
        </label>
        <label>Words <input name="q" value={f.q} type="search" /></label>
        <button type="submit">Filter</button>
      </form>
      <p class="hint">{count(props.total)} answers match.</p>
      <ol class="answer-list" start={props.offset + 1}>
        {props.answers.map((a) => (
          <li>
            <blockquote dir="auto">{a.text}</blockquote>
            <div class="meta">
              <span>Row {a.rowId}</span> · <span>{a.language}</span>
              {a.question && <> · <span>{a.question}</span></>}
              {a.covariates && <> · <span>{a.covariates}</span></>}
            </div>
            <div class="mix">
              <ShareStrip label="Theme mix" width={200} parts={a.mix.map((m) => ({ label: String(m.k + 1), share: m.share, colour: m.k }))} />
              <span>{a.mix.filter((m) => m.share >= 0.05).slice(0, 3).map((m) => `${m.label} ${percent(m.share, 0)}`).join(' · ')}</span>
            </div>
          </li>
        ))}
      </ol>
      {f.q ? (
        <PostPager action={`${props.base}/answers`} fields={{ language: f.language, theme: f.theme, group: f.by ? `${f.by}=${f.level}` : '', q: f.q }} csrf={props.frame.csrf} offset={props.offset} limit={props.limit} total={props.total} />
      ) : (
        <Pager base={`${props.base}/answers`} query={{ language: f.language, theme: f.theme, group: f.by ? `${f.by}=${f.level}` : '' }} offset={props.offset} limit={props.limit} total={props.total} />
      )}
    </Layout>
  );
}
