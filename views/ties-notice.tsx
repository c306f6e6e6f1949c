// The warning that a study's languages are not tied together (issue 12): with no answers linked
// across languages and no glossary, nothing in the fit makes a theme mean the same thing in every
// language ("Polylingual Topic Models", EMNLP 2009, ties languages only through linked tuples), so
// a theme's words may be about different things in each language.
import { count, Notice } from './components.js';

export interface TiesFacts {
  readonly languages: number;
  readonly answerGroupsAcrossLanguages: number;
  readonly glossaryRowsAcrossLanguages: number;
}

/** Below this many links, alignment rests on very little (common practice: a handful is not evidence). */
const FEW_LINKS = 20;

export function TiesNotice(props: { links: TiesFacts; studyId: number; when: 'before' | 'after' }) {
  const { languages, answerGroupsAcrossLanguages: groups, glossaryRowsAcrossLanguages: rows } = props.links;
  if (languages < 2) return <></>;
  const fix = (
    <>
      {' '}To tie them, import answers with a <a href={`/studies/${props.studyId}/data`}>link-key column</a> (translations or paired answers share a key), or a glossary: one
      row per concept, one column per language.
    </>
  );
  if (groups === 0 && rows === 0) {
    return (
      <div id="ties-notice">
        <Notice kind="error">
          <strong>The languages of this study are not tied together.</strong> No answers share a link key across languages and there is no glossary, so nothing makes a
          theme mean the same thing in every language: {props.when === 'after' ? "this run's" : 'a run’s'} theme may gather different subjects in each language.
          {props.when === 'after' && ' Compare its words across languages before trusting a label.'}
          {fix}
        </Notice>
      </div>
    );
  }
  if (groups + rows < FEW_LINKS) {
    return (
      <div id="ties-notice">
        <Notice>
          Only {count(groups)} linked {groups === 1 ? 'group' : 'groups'} of answers and {count(rows)} glossary {rows === 1 ? 'row' : 'rows'} tie the {languages} languages
          together: themes may line up only partly across languages.{fix}
        </Notice>
      </div>
    );
  }
  return <></>;
}

/**
 * For pages that do not gather the facts themselves (the Runs page): the notice is fetched once
 * the page has loaded, from /studies/:id/ties-notice.
 */
export function TiesNoticeSlot(props: { studyId: number }) {
  return <div hx-get={`/studies/${props.studyId}/ties-notice`} hx-trigger="load" hx-swap="outerHTML"></div>;
}
