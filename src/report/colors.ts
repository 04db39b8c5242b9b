/**
 * Okabe & Ito (2008, "Color Universal Design") palette: distinguishable with the common forms of
 * colour blindness. Sides of the galaxy and model/data pairs always use the same two colours.
 */
export const COLORS = {
  approaching: '#0072B2', // blue
  receding: '#D55E00', // vermilion
  combined: '#000000',
  model: '#E69F00', // orange
  data: '#56B4E9', // sky blue
  accent: '#009E73', // bluish green
  flagged: '#CC79A7', // reddish purple
  muted: '#999999',
} as const;
