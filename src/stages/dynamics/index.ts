export * from './settings.js';
export { computeDynamics, type DynamicsResult } from './dynamics.js';
