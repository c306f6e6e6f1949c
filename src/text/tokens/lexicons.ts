// The shipped survey lexicons (lexicons/survey-fillers/*.json, written for Themata; provenance
// in each file). Imported as modules so the pipeline stays free of file-system access.
import de from '../../../lexicons/survey-fillers/de.json' with { type: 'json' };
import en from '../../../lexicons/survey-fillers/en.json' with { type: 'json' };
import es from '../../../lexicons/survey-fillers/es.json' with { type: 'json' };
import fr from '../../../lexicons/survey-fillers/fr.json' with { type: 'json' };
import it from '../../../lexicons/survey-fillers/it.json' with { type: 'json' };
import ja from '../../../lexicons/survey-fillers/ja.json' with { type: 'json' };
import ko from '../../../lexicons/survey-fillers/ko.json' with { type: 'json' };
import nl from '../../../lexicons/survey-fillers/nl.json' with { type: 'json' };
import pt from '../../../lexicons/survey-fillers/pt.json' with { type: 'json' };
import ru from '../../../lexicons/survey-fillers/ru.json' with { type: 'json' };
import sv from '../../../lexicons/survey-fillers/sv.json' with { type: 'json' };
import zh from '../../../lexicons/survey-fillers/zh.json' with { type: 'json' };

export interface SurveyLexicon {
  readonly language: string;
  readonly provenance: string;
  readonly license: string;
  /** Whole answers that say nothing. */
  readonly nonAnswers: readonly string[];
  /** Words without a theme, added to the stop words. */
  readonly fillers: readonly string[];
  /** Words of the open stop-word list that name survey themes: taken off the stop words. */
  readonly keep?: readonly string[];
}

export const SURVEY_LEXICONS: readonly SurveyLexicon[] = [de, en, es, fr, it, ja, ko, nl, pt, ru, sv, zh];

/** The survey lexicon of a language (BCP 47 subtag), if one ships. */
export function surveyLexicon(language: string): SurveyLexicon | undefined {
  return SURVEY_LEXICONS.find((lexicon) => lexicon.language === language);
}
