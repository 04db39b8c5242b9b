export { subtractSky } from './subtract.js';
export { DEFAULT_SKY_SETTINGS, type SkySettings } from './settings.js';
