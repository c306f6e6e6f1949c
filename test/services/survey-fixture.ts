// A small invented bilingual survey for the services and command-line tests (written for these
// tests; no outside source). Themes: opening hours, wifi, children's programmes; English and
// Spanish; some answers linked to a translation; region (with formula-like values to exercise the
// injection guard), age (numeric) and a survey weight.
const EN = {
  hours: ['open later in the evening please', 'longer opening hours on weekends', 'the library closes too early in the evening', 'please open on sunday morning and evening'],
  wifi: ['the wifi is slow and the computers are old', 'faster wifi and more computers please', 'wifi keeps dropping on my laptop', 'new computers and better wifi connection'],
  kids: ['more story time for children and families', 'children need a bigger reading corner', 'activities for kids and parents on saturday', 'family programmes for young children'],
};
const ES = {
  hours: ['abrir más tarde por la noche por favor', 'horario más largo los fines de semana', 'la biblioteca cierra demasiado temprano por la noche', 'abrir el domingo por la mañana y la noche'],
  wifi: ['el wifi es lento y los ordenadores son viejos', 'wifi más rápido y más ordenadores', 'el wifi se corta en mi portátil', 'ordenadores nuevos y mejor conexión wifi'],
  kids: ['más cuentos para niños y familias', 'los niños necesitan un rincón de lectura más grande', 'actividades para niños y padres el sábado', 'programas familiares para niños pequeños'],
};

export const REGIONS = ['North', 'South', '=Coast', '@Hills'];

export interface FixtureRow {
  id: string;
  answer: string;
  lang: string;
  link: string;
  region: string;
  age: string;
  weight: string;
}

/** n rows (deterministic); every 10th English row is followed by its Spanish translation. */
export function surveyRows(n = 80): FixtureRow[] {
  const rows: FixtureRow[] = [];
  const themes = ['hours', 'wifi', 'kids'] as const;
  for (let i = 0; rows.length < n; i++) {
    const theme = themes[i % 3];
    const lang = i % 2 === 0 ? 'en' : 'es';
    const bank = lang === 'en' ? EN : ES;
    const a = bank[theme][i % 4];
    const b = bank[theme][(i + 1) % 4];
    const region = REGIONS[i % 4];
    const base = { region, age: String(18 + ((i * 7) % 60)), weight: (0.5 + (i % 5) * 0.25).toFixed(2) };
    const linked = lang === 'en' && i % 10 === 0;
    rows.push({ id: i === 3 ? '-3' : `r${i}`, answer: `${a}, ${b}`, lang, link: linked ? `L${i}` : '', ...base });
    if (linked && rows.length < n) rows.push({ id: `r${i}t`, answer: `${ES[theme][i % 4]}, ${ES[theme][(i + 1) % 4]}`, lang: 'es', link: `L${i}`, ...base });
  }
  return rows;
}

export function surveyCsv(rows: FixtureRow[], delimiter = ','): string {
  const q = (s: string) => (/[",\n\t;]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s);
  const header = ['id', 'answer', 'lang', 'link', 'region', 'age', 'weight'];
  return [header.join(delimiter), ...rows.map((r) => header.map((h) => q(r[h as keyof FixtureRow])).join(delimiter))].join('\n') + '\n';
}

export function surveyJsonl(rows: FixtureRow[]): string {
  return rows.map((r) => JSON.stringify(r)).join('\n') + '\n';
}

/** Column flags for the CLI import of this fixture. */
export const FIXTURE_FLAGS = ['--text', 'answer', '--id', 'id', '--lang', 'lang', '--link', 'link', '--covariate', 'region', '--covariate', 'age:numeric', '--weight', 'weight'];

export const FIXTURE_MAPPING = {
  id: 'id',
  text: ['answer'],
  language: 'lang',
  link: 'link',
  covariates: [
    { column: 'region', type: 'categorical' as const },
    { column: 'age', type: 'numeric' as const },
  ],
  weight: 'weight',
};
