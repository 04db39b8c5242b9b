/**
 * The public library surface of whorl. Each area re-exports its public names from its own
 * index; test/index.test.ts pins the list.
 */
export * from './errors.js';
export * from './diagnostics.js';
export * from './version.js';
export * from './kernels/index.js';
export * from './physics/index.js';
export * from './fits/index.js';
export * from './products/index.js';
export * from './stages/ccd/index.js';
export * from './stages/arc/index.js';
export * from './stages/sky/index.js';
export * from './stages/lines/index.js';
export * from './stages/velocity/index.js';
export * from './stages/geometry/index.js';
export * from './stages/dynamics/index.js';
export * from './sim/index.js';
export * from './run/index.js';
export * from './report/index.js';
