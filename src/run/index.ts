export * from './manifest/index.js';
export * from './names.js';
