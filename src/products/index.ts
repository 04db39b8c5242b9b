export * from './frame.js';
export * from './wavelength.js';
export * from './lines.js';
export * from './curve.js';
export * from './orientation.js';
export * from './writers/index.js';
