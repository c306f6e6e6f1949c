// Public surface of the store: the only code in Themata that speaks SQL (DESIGN §2).
// Every function takes the Store from openStore(dataDir) first; multi-row writes are one
// transaction each; wrap several calls in inTransaction() to make them one.
export { openStore, inTransaction, withBusyRetry, isBusyError, DATABASE_FILE, type Store, type OpenStoreOptions } from './database.js';
export { migrate, schemaVersion, SCHEMA_VERSION, MIGRATIONS, type Migration } from './migrations.js';
export { createStudy, getStudy, getStudyByName, listStudies, updateStudy, touchStudy, deleteStudy, type Study, type StudyListItem } from './studies.js';
export { insertImport, setImportSummary, listImports, getImport, getImportBytes, sha256Hex, type ImportRecord } from './imports.js';
export {
  insertDocuments,
  setDocumentTokens,
  listDocuments,
  iterateDocuments,
  getDocument,
  listDocumentTokens,
  listDocumentTexts,
  overrideLanguages,
  adoptWrittenLanguages,
  languageSummary,
  exclusionSummary,
  documentTokensByIds,
  studyChangeStamp,
  covariateLevels,
  type NewDocument,
  type DocumentRecord,
  type DocumentTokens,
  type DocumentFilter,
  type LanguageSummaryRow,
} from './documents.js';
export { replaceVocabularies, vocabularySizes, topWords, loadVocabulary, getStudyWordLists, setStudyWordList, type VocabularyWord } from './vocabularies.js';
export {
  createRun,
  getRun,
  getRunByName,
  listRuns,
  listRunsByStatus,
  uniqueRunName,
  setRunStatus,
  setRunProgress,
  markRunningAsInterrupted,
  renameRun,
  deleteRun,
  saveCheckpoint,
  latestCheckpoint,
  clearCheckpoints,
  type Run,
  type RunStatus,
  type RunSettings,
  type RunProgress,
} from './runs.js';
export {
  saveResults,
  loadResult,
  loadJsonResult,
  loadResults,
  listResultKeys,
  getThemeLabels,
  setThemeLabel,
  setThemeLabels,
  saveRunExport,
  listRunExports,
  getRunExportBytes,
  type ResultValue,
  type StoredResult,
  type RunExport,
} from './results.js';
export {
  createAccount,
  getAccount,
  getAccountByName,
  listAccounts,
  countAccounts,
  checkPassword,
  setPassword,
  createSession,
  getSession,
  deleteSession,
  deleteExpiredSessions,
  addStudyMember,
  removeStudyMember,
  studyRole,
  listStudyMembers,
  type Account,
  type Session,
  type StudyRole,
} from './accounts.js';
export { hashPassword, verifyPassword } from './password.js';
