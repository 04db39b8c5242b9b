/** Thresholds of the curve-shape classification (d ln V / d ln R of the outer curve). Chosen here; no published standard. */
export interface DynamicsSettings {
  /** The outer curve: points beyond this fraction of the largest radius (at least three points). Default 0.5. */
  outerFraction: number;
  /** |slope| up to this is flat. Default 0.1 (V changes by < 7% over a factor 2 in radius). */
  flatSlope: number;
  /** A slope within this (or two sigma, if larger) of -0.5 is Keplerian-like. Default 0.15. */
  keplerianTolerance: number;
  /** A slope error above this leaves the shape undetermined. Default 0.2. */
  maxSlopeErr: number;
}

export const DEFAULT_DYNAMICS_SETTINGS: Readonly<DynamicsSettings> = Object.freeze({
  outerFraction: 0.5,
  flatSlope: 0.1,
  keplerianTolerance: 0.15,
  maxSlopeErr: 0.2,
});
