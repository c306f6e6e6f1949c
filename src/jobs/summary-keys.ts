// Names of the run summaries the fit worker stores beside the fit results.

/** Bootstrap × posterior draws for stored group contrasts (common practice for 95% percentile intervals). */
export const CONTRAST_DRAWS = 1000;

export function contrastKey(covariate: string): string {
  return `contrast:${covariate}`;
}
