export * from './settings.js';
export { buildRotationCurve } from './build.js';
export { resolveInclination, type ResolvedInclination } from './inclination.js';
