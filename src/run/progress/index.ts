export * from './json.js';
export * from './plain.js';
export * from './live.js';
