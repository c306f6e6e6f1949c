// The demo study (issue 3): on first start with an empty data folder, import the committed demo
// survey once, so a newcomer's first screen has data; later starts reuse it.
import { readFile } from 'node:fs/promises';
import { fileURLToPath } from 'node:url';
import { getStudyByName, listStudies, type Store } from '../store/index.js';
import { importFile, type ImportProgress, type ImportSummary } from './import-file.js';

export const DEMO_STUDY_NAME = 'Library survey (demo)';
export const DEMO_FILE = fileURLToPath(new URL('../../demo/library-survey.csv', import.meta.url));

export interface DemoOutcome {
  /** 'imported' the first time; 'present' when the demo study exists; 'skipped' when the folder holds other studies. */
  readonly status: 'imported' | 'present' | 'skipped';
  readonly studyId: number | null;
  readonly summary: ImportSummary | null;
}

/** Import the demo once into an empty data folder. */
export async function ensureDemoStudy(store: Store, onProgress?: (p: ImportProgress) => void): Promise<DemoOutcome> {
  const present = getStudyByName(store, DEMO_STUDY_NAME);
  if (present) return { status: 'present', studyId: present.id, summary: null };
  if (listStudies(store).length > 0) return { status: 'skipped', studyId: null, summary: null };
  // Loaded lazily so the services load even where the demo folder is not shipped.
  const { DEMO_COLUMNS } = await import('../../demo/index.js');
  const bytes = new Uint8Array(await readFile(DEMO_FILE));
  const summary = await importFile(store, { study: DEMO_STUDY_NAME, bytes, fileName: 'library-survey.csv', mapping: DEMO_COLUMNS, onProgress });
  return { status: 'imported', studyId: summary.studyId, summary };
}
