export * from './schema.js';
export * from './parse.js';
export * from './glob.js';
export * from './resolve.js';
