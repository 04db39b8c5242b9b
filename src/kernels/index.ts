export * from './robust.js';
export * from './legendre.js';
export * from './least-squares.js';
export * from './legendre-fit.js';
export * from './cross-correlate.js';
export * from './cholesky.js';
export * from './levenberg-marquardt.js';
export * from './gaussian-fit.js';
