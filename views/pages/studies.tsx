// Studies: what you are working on, how big each study is, and when it last changed.
import { Layout, CsrfField, type PageFrame } from '../layout.js';
import { count, Notice, when } from '../components.js';

export interface StudyRow {
  readonly id: number;
  readonly name: string;
  readonly documents: number;
  readonly imports: number;
  readonly runs: number;
  readonly languages: string[];
  readonly lastActivity: string;
}

export function StudiesPage(props: { frame: PageFrame; studies: readonly StudyRow[]; error?: string; name?: string }) {
  return (
    <Layout {...props.frame}>
      <h1>Studies</h1>
      <p class="lead">A study holds the answers of one survey or consultation, in every language it was run in, and the theme runs fitted to them.</p>
      {props.studies.length === 0 ? (
        <Notice>No studies yet. Create one below, then upload your answers.</Notice>
      ) : (
        <table class="list" id="studies">
          <thead>
            <tr>
              <th scope="col">Study</th>
              <th scope="col" class="num">Answers</th>
              <th scope="col">Languages</th>
              <th scope="col" class="num">Files</th>
              <th scope="col" class="num">Runs</th>
              <th scope="col">Last activity</th>
            </tr>
          </thead>
          <tbody>
            {props.studies.map((s) => (
              <tr>
                <td><a href={`/studies/${s.id}/data`}>{s.name}</a></td>
                <td class="num">{count(s.documents)}</td>
                <td>{s.languages.join(', ') || '—'}</td>
                <td class="num">{count(s.imports)}</td>
                <td class="num">{count(s.runs)}</td>
                <td>{when(s.lastActivity)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
      <section class="panel">
        <h2>New study</h2>
        {props.error && <Notice kind="error">{props.error}</Notice>}
        <form method="post" action="/studies" class="stack">
          <CsrfField csrf={props.frame.csrf} />
          <label>
            Name <input name="name" required maxlength={200} value={props.name ?? ''} />
          </label>
          <label>
            Languages the answers were written in <input name="languages" placeholder="e.g. en, es, fr" />
            <span class="hint">Optional. Language detection chooses only among these; leave empty to let Themata choose among the languages it knows.</span>
          </label>
          <button type="submit">Create study</button>
        </form>
      </section>
    </Layout>
  );
}
