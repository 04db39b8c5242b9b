export * from './settings.js';
export * from './compute.js';
export { frameCorrection, pointingFromHeader, SPREAD_WARNING_KMS } from './frame-correction.js';
export { lineVelocity, type LineVelocity } from './line-velocity.js';
