export * from './curve.js';
export * from './rows.js';
export * from './light.js';
export * from './modeller.js';
