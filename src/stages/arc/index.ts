export * from './settings.js';
export { solveWavelengths } from './solve.js';
export { measureFlexure } from './flexure.js';
