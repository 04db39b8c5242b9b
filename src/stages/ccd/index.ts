export * from './settings.js';
export * from './calibration.js';
export * from './build-calibration.js';
export * from './calibrate-science.js';
export * from './section.js';
export type { Detector, ReferenceFrame } from './detector.js';
