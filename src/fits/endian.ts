/** FITS data are big-endian (FITS Standard 4.0, section 5); the host's order decides whether the readers and writers swap bytes. */
export const LITTLE_ENDIAN = new Uint8Array(new Uint32Array([1]).buffer)[0] === 1;
