export * from './manifest/index.js';
export * from './names.js';
export * from './inventory/index.js';
