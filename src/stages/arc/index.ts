export * from './settings.js';
export { solveWavelengths } from './solve.js';
