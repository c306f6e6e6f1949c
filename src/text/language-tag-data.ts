// Language code table used by language-tags.ts.
//
// Source: ISO 639-1 / ISO 639-2 (B and T) / ISO 639-3 code tables as published by SIL
// International (the ISO 639-3 Registration Authority, https://iso639-3.sil.org), written down
// from memory, not generated from a downloaded copy; the `detector` column is the
// individual-language ISO 639-3 code that the `franc` package (6.2.0) reports for the language
// (checked against node_modules/franc/data.js and expressions.js), e.g. Mandarin `cmn` for
// Chinese, Standard Arabic `arb` for Arabic, Tagalog `tgl` for Filipino. Welsh, Basque, Irish
// and Icelandic are not among franc's languages; their column holds the plain ISO 639-3 code. English names follow the ISO 639 reference names;
// the autonyms (names of a language in itself) are common practice in survey exports.
//
// Columns: [BCP 47 primary subtag, detector ISO 639-3 code, other accepted 3-letter codes
// (ISO 639-2/T, 639-2/B, macrolanguage and individual codes), English names, autonyms].

export type LanguageRow = readonly [
  subtag: string,
  detector: string,
  otherCodes: readonly string[],
  englishNames: readonly string[],
  autonyms: readonly string[],
];

export const LANGUAGE_ROWS: readonly LanguageRow[] = [
  ['af', 'afr', [], ['Afrikaans'], []],
  ['am', 'amh', [], ['Amharic'], ['አማርኛ']],
  ['ar', 'arb', ['ara'], ['Arabic', 'Standard Arabic', 'Modern Standard Arabic'], ['العربية']],
  ['az', 'azj', ['aze', 'azb'], ['Azerbaijani', 'Azeri'], ['azərbaycan dili', 'azərbaycanca']],
  ['be', 'bel', [], ['Belarusian'], ['беларуская']],
  ['bg', 'bul', [], ['Bulgarian'], ['български']],
  ['bn', 'ben', [], ['Bengali', 'Bangla'], ['বাংলা']],
  ['bs', 'bos', [], ['Bosnian'], ['bosanski']],
  ['ca', 'cat', [], ['Catalan', 'Valencian'], ['català']],
  ['cs', 'ces', ['cze'], ['Czech'], ['čeština']],
  ['cy', 'cym', ['wel'], ['Welsh'], ['Cymraeg']],
  ['da', 'dan', [], ['Danish'], ['dansk']],
  ['de', 'deu', ['ger'], ['German'], ['Deutsch']],
  ['el', 'ell', ['gre'], ['Greek', 'Modern Greek'], ['Ελληνικά']],
  ['en', 'eng', [], ['English'], []],
  ['eo', 'epo', [], ['Esperanto'], []],
  ['es', 'spa', [], ['Spanish', 'Castilian'], ['español', 'castellano']],
  ['et', 'ekk', ['est'], ['Estonian'], ['eesti', 'eesti keel']],
  ['eu', 'eus', ['baq'], ['Basque'], ['euskara']],
  ['fa', 'pes', ['fas', 'per', 'prs'], ['Persian', 'Farsi', 'Dari'], ['فارسی']],
  ['fi', 'fin', [], ['Finnish'], ['suomi']],
  ['fil', 'tgl', ['fil'], ['Filipino', 'Tagalog'], ['Wikang Filipino']],
  ['fr', 'fra', ['fre'], ['French'], ['français']],
  ['ga', 'gle', [], ['Irish', 'Irish Gaelic'], ['Gaeilge']],
  ['gl', 'glg', [], ['Galician'], ['galego']],
  ['gu', 'guj', [], ['Gujarati'], ['ગુજરાતી']],
  ['ha', 'hau', [], ['Hausa'], []],
  ['he', 'heb', [], ['Hebrew'], ['עברית']],
  ['hi', 'hin', [], ['Hindi'], ['हिन्दी', 'हिंदी']],
  ['hr', 'hrv', [], ['Croatian'], ['hrvatski']],
  ['hu', 'hun', [], ['Hungarian'], ['magyar']],
  ['hy', 'hye', ['arm'], ['Armenian'], ['հայերեն']],
  ['id', 'ind', [], ['Indonesian'], ['Bahasa Indonesia']],
  ['is', 'isl', ['ice'], ['Icelandic'], ['íslenska']],
  ['it', 'ita', [], ['Italian'], ['italiano']],
  ['ja', 'jpn', [], ['Japanese'], ['日本語']],
  ['jv', 'jav', [], ['Javanese'], ['basa Jawa']],
  ['ka', 'kat', ['geo'], ['Georgian'], ['ქართული']],
  ['kk', 'kaz', [], ['Kazakh'], ['қазақ тілі']],
  ['km', 'khm', [], ['Khmer', 'Cambodian'], ['ខ្មែរ']],
  ['kn', 'kan', [], ['Kannada'], ['ಕನ್ನಡ']],
  ['ko', 'kor', [], ['Korean'], ['한국어']],
  ['ku', 'ckb', ['kur', 'kmr'], ['Kurdish', 'Central Kurdish', 'Sorani'], ['کوردی']],
  ['ky', 'kir', [], ['Kyrgyz', 'Kirghiz'], ['кыргызча']],
  ['lo', 'lao', [], ['Lao'], ['ລາວ']],
  ['lt', 'lit', [], ['Lithuanian'], ['lietuvių']],
  ['lv', 'lvs', ['lav'], ['Latvian'], ['latviešu']],
  ['mk', 'mkd', ['mac'], ['Macedonian'], ['македонски']],
  ['ml', 'mal', [], ['Malayalam'], ['മലയാളം']],
  ['mn', 'khk', ['mon'], ['Mongolian'], ['монгол']],
  ['mr', 'mar', [], ['Marathi'], ['मराठी']],
  ['ms', 'zlm', ['msa', 'may', 'zsm'], ['Malay'], ['Bahasa Melayu']],
  ['my', 'mya', ['bur'], ['Burmese', 'Myanmar'], ['မြန်မာ']],
  ['nb', 'nob', ['nor'], ['Norwegian', 'Norwegian Bokmål', 'Bokmål', 'Bokmal'], ['norsk', 'norsk bokmål']],
  ['ne', 'npi', ['nep'], ['Nepali'], ['नेपाली']],
  ['nl', 'nld', ['dut'], ['Dutch', 'Flemish'], ['Nederlands']],
  ['nn', 'nno', [], ['Norwegian Nynorsk', 'Nynorsk'], ['nynorsk']],
  ['pa', 'pan', [], ['Punjabi', 'Panjabi'], ['ਪੰਜਾਬੀ']],
  ['pl', 'pol', [], ['Polish'], ['polski']],
  ['ps', 'pbu', ['pus'], ['Pashto', 'Pushto'], ['پښتو']],
  ['pt', 'por', [], ['Portuguese'], ['português']],
  ['ro', 'ron', ['rum', 'mol'], ['Romanian', 'Moldavian', 'Moldovan'], ['română']],
  ['ru', 'rus', [], ['Russian'], ['русский']],
  ['rw', 'kin', [], ['Kinyarwanda'], ['Ikinyarwanda']],
  ['si', 'sin', [], ['Sinhala', 'Sinhalese'], ['සිංහල']],
  ['sk', 'slk', ['slo'], ['Slovak'], ['slovenčina']],
  ['sl', 'slv', [], ['Slovenian', 'Slovene'], ['slovenščina']],
  ['so', 'som', [], ['Somali'], ['Soomaali']],
  ['sq', 'als', ['sqi', 'alb'], ['Albanian'], ['shqip']],
  ['sr', 'srp', [], ['Serbian'], ['српски', 'srpski']],
  ['sv', 'swe', [], ['Swedish'], ['svenska']],
  ['sw', 'swh', ['swa'], ['Swahili', 'Kiswahili'], ['Kiswahili']],
  ['ta', 'tam', [], ['Tamil'], ['தமிழ்']],
  ['te', 'tel', [], ['Telugu'], ['తెలుగు']],
  ['tg', 'tgk', [], ['Tajik'], ['тоҷикӣ']],
  ['th', 'tha', [], ['Thai'], ['ไทย', 'ภาษาไทย']],
  ['ti', 'tir', [], ['Tigrinya'], ['ትግርኛ']],
  ['tk', 'tuk', [], ['Turkmen'], ['türkmençe']],
  ['tr', 'tur', [], ['Turkish'], ['Türkçe']],
  ['uk', 'ukr', [], ['Ukrainian'], ['українська']],
  ['ur', 'urd', [], ['Urdu'], ['اردو']],
  ['uz', 'uzn', ['uzb'], ['Uzbek'], ["o'zbek", 'oʻzbekcha']],
  ['vi', 'vie', [], ['Vietnamese'], ['Tiếng Việt']],
  ['xh', 'xho', [], ['Xhosa', 'isiXhosa'], []],
  ['yi', 'ydd', ['yid'], ['Yiddish'], ['ייִדיש']],
  ['yo', 'yor', [], ['Yoruba'], ['Yorùbá']],
  ['zh', 'cmn', ['zho', 'chi', 'yue'], ['Chinese', 'Mandarin', 'Mandarin Chinese', 'Cantonese'], ['中文', '汉语', '漢語', '普通话', '國語']],
  ['zu', 'zul', [], ['Zulu', 'isiZulu'], []],
];

/**
 * Two-letter codes that map to another subtag. Deprecated codes still seen in old exports
 * (IANA Language Subtag Registry "Preferred-Value" entries, from memory): iw → he, in → id,
 * ji → yi, jw → jv, mo → ro; tl → fil because Filipino is the standardized form of Tagalog;
 * the Norwegian macrolanguage `no` → `nb` (Bokmål), which most written Norwegian is.
 */
export const SUBTAG_ALIASES: Readonly<Record<string, string>> = {
  iw: 'he',
  in: 'id',
  ji: 'yi',
  jw: 'jv',
  mo: 'ro',
  tl: 'fil',
  no: 'nb',
};
