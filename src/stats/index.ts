// Public surface of src/stats: group contrasts, survey weights, intervals (docs/design.md §6).
export { weightedMean, kishEffectiveN, kishEffectiveNOf } from './weighted.js';
export { quantile, quantileSorted, sortedFinite, percentileInterval } from './quantile.js';
export { benjaminiHochberg, type FdrResult } from './fdr.js';
export { quantileBins, type Binning } from './bins.js';
export {
  groupContrasts,
  type ThetaSamples,
  type ContrastCovariate,
  type ContrastOptions,
  type ShareRow,
  type DifferenceRow,
  type ContrastResult,
} from './contrasts.js';
