export { measureLines } from './measure.js';
export { DEFAULT_LINE_SETTINGS, type LineSettings } from './settings.js';
