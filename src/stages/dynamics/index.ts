export * from './settings.js';
export * from './log-slope.js';
export * from './shape.js';
export * from './dynamics.js';
