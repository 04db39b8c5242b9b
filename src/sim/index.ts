export * from './options.js';
export * from './truth.js';
export * from './simulate.js';
export * from './convert.js';
export type { FrameKind } from './schedule.js';
export * from './write.js';
