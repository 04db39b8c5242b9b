export * from './types.js';
export * from './rules.js';
export * from './classify.js';
export * from './group.js';
export * from './draft.js';
export * from './scan.js';
