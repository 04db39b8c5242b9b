export * from './robust.js';
export * from './legendre.js';
