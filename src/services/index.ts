// Public surface of the services: orchestration that glues the pure core (text, model, stats)
// to the store. Used by the command line, the workbench routes and the fit worker.
export { importFile, type ImportOptions, type ImportSummary, type ImportProgress } from './import-file.js';
export { rebuildVocabulary, type VocabularyRebuild } from './vocabulary.js';
export { importGlossary, listGlossaries, glossaryTermsByLanguage, glossaryLinkKey, type GlossaryOptions, type GlossarySummary, type GlossaryListing } from './glossary.js';
export { fitSettings, validateFit, createFitRun, requireStudy, answersToFit, type FitRequest, type FitPlace } from './fit-run.js';
export { runFitJob, prepareCorpus, FIT_PHASES, type FitPhase, type FitJobOptions, type FitJobOutcome, type PreparedCorpus, type FitDiagnostics } from './fit-job.js';
export { CONTRAST_DRAWS, contrastKey, computeRunSummaries, summarySteps, runTies, runContrastCovariates, type SummaryHooks } from './run-summaries.js';
export {
  NUMBER_SETTINGS,
  COVARIATES_SETTING,
  NAME_SETTING,
  numberSetting,
  settingWord,
  readFitRequest,
  runSettingsOf,
  checkRunSettings,
  modelSettingsOf,
  defaultBurnIn,
  flagHelp,
  type NumberSettingName,
  type NumberSettingSpec,
  type SettingLimits,
  type Wording,
} from './run-settings-schema.js';
export { loadRunModel, themeWords, documentMixtures, overallShares, dominantTheme, themeLabel, type RunModel, type ThemeWord } from './run-model.js';
export { runContrasts, contrastCovariates, SHARES_HEADER, type ContrastRequest } from './contrasts.js';
export { exportRun, buildBundle, studyAnswerRows, studyCovariates, studyIdColumn, type ExportedFile, type ExportOptions } from './export-run.js';
export { applyRun, type ApplyOptions, type ApplySummary } from './apply-run.js';
export { encodeBundle, decodeBundle, openBundle, UntrustedBundleError, BUNDLE_EXTENSION, type RunBundle, type BundleOrigin } from './bundle.js';
export { installationKey, BUNDLE_KEY_FILE } from '../platform/index.js';
export { answersTable, shareColumns, type AnswerRow } from './answers-table.js';
export { toCsv, csvBytes, guardCell, round6 } from './csv.js';
export { exportTables, exportFiles } from './export-run.js';
export { exportWorkbook } from './export-workbook.js';
export { describeCovariateNote } from './apply-covariates.js';
export { foldInDocuments, type FoldInDocument, type FoldInResult } from './fold-in.js';
export { ensureDemoStudy, DEMO_STUDY_NAME, DEMO_FILE, type DemoOutcome } from './demo.js';
export { runChecks, CHECKS_VERSION, type RunChecks } from './checks.js';
export {
  planStudyRemoval,
  planRunRemoval,
  planImportRemoval,
  removeStudy,
  removeRun,
  removeImport,
  describeStudyContents,
  describeRunContents,
  formatBytes,
  type FitStopper,
  type StudyRemovalPlan,
  type RunRemovalPlan,
  type ImportRemovalPlan,
  type RemovalOutcome,
} from './removal.js';
export { estimateFit, describeEstimate, formatDuration, type FitEstimate, type MachineSize } from './fit-estimate.js';
export { acceptWrittenLanguages, setAnswerLanguages } from './language-review.js';
export { readInputTable, pipelineSettings } from './text-pipeline.js';
export { bundleFileName } from './export-run.js';
