// Colours for charts: the eight-colour palette of Okabe & Ito, "Color Universal Design (CUD):
// how to make figures and presentations that are friendly to colorblind people" (2008), which
// stays distinguishable under the common colour-vision deficiencies and in greyscale print when
// paired with the labels every chart carries.
export const OKABE_ITO = {
  black: '#000000',
  orange: '#E69F00',
  skyBlue: '#56B4E9',
  bluishGreen: '#009E73',
  yellow: '#F0E442',
  blue: '#0072B2',
  vermillion: '#D55E00',
  reddishPurple: '#CC79A7',
} as const;

/** Series colours in a fixed order (black last: it is kept for axes and text). */
export const SERIES_COLOURS: readonly string[] = [
  OKABE_ITO.blue,
  OKABE_ITO.orange,
  OKABE_ITO.bluishGreen,
  OKABE_ITO.vermillion,
  OKABE_ITO.reddishPurple,
  OKABE_ITO.skyBlue,
  OKABE_ITO.yellow,
];

export function seriesColour(i: number): string {
  return SERIES_COLOURS[((i % SERIES_COLOURS.length) + SERIES_COLOURS.length) % SERIES_COLOURS.length];
}
