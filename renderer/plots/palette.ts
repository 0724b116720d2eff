/**
 * Series colours distinguishable with the common colour-vision deficiencies: the Okabe–Ito palette
 * (Okabe & Ito 2008, "Color Universal Design"; hex values as commonly reproduced, from memory).
 * Limits are also dashed, so they never rely on colour alone.
 */
export const SERIES = {
  orange: '#E69F00',
  skyBlue: '#56B4E9',
  green: '#009E73',
  yellow: '#F0E442',
  blue: '#0072B2',
  vermillion: '#D55E00',
  purple: '#CC79A7',
} as const;

/** Colours of the chart furniture on the app's dark panels. */
export const CHART_INK = { text: '#c9d3dc', grid: 'rgba(201, 211, 220, 0.12)', limit: '#e8ecef' } as const;

/** Trajectory colours, in order: the same in the 3D scene and in the charts, so a curve matches its path. */
export const TRAJECTORY_COLOURS = [SERIES.orange, SERIES.skyBlue, SERIES.purple, SERIES.yellow, SERIES.green] as const;
