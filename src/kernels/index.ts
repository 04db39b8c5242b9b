export * from './robust.js';
export * from './legendre.js';
export * from './least-squares.js';
export * from './legendre-fit.js';
export * from './cross-correlate.js';
