/**
 * Air and vacuum wavelengths, Morton (2000, ApJS 130, 403) eq. 8, the IAU standard for standard air
 * (15 C, 101325 Pa, dry): n - 1 = 8.34254e-5 + 2.406147e-2 / (130 - s^2) + 1.5998e-4 / (38.9 - s^2),
 * s = 1e4 / lambda_vac (1/micron). Valid above 2000 A; below, air and vacuum are taken equal
 * (NIST lists vacuum wavelengths there).
 */

/** Below this vacuum wavelength (Angstrom) the conversion is the identity, as in NIST ASD. */
const AIR_LIMIT_ANGSTROM = 2000;

function refractiveIndexFromVacuum(lambdaVacAngstrom: number): number {
  const s2 = (1e4 / lambdaVacAngstrom) ** 2;
  return 1 + 8.34254e-5 + 2.406147e-2 / (130 - s2) + 1.5998e-4 / (38.9 - s2);
}

function checkWavelength(name: string, lambda: number): void {
  if (!(lambda > 0) || !Number.isFinite(lambda)) throw new RangeError(`${name}: invalid wavelength ${lambda} A`);
}

/** Air wavelength (Angstrom, standard air) of a vacuum wavelength (Angstrom). */
export function vacuumToAir(lambdaVacAngstrom: number): number {
  checkWavelength('vacuumToAir', lambdaVacAngstrom);
  if (lambdaVacAngstrom < AIR_LIMIT_ANGSTROM) return lambdaVacAngstrom;
  return lambdaVacAngstrom / refractiveIndexFromVacuum(lambdaVacAngstrom);
}

/**
 * Vacuum wavelength (Angstrom) of an air wavelength (Angstrom), by fixed-point iteration of
 * lambda_vac = lambda_air * n(lambda_vac); n varies slowly, so each step gains ~4 digits.
 */
export function airToVacuum(lambdaAirAngstrom: number): number {
  checkWavelength('airToVacuum', lambdaAirAngstrom);
  let vac = lambdaAirAngstrom * refractiveIndexFromVacuum(lambdaAirAngstrom);
  for (let i = 0; i < 8; i++) {
    const next = lambdaAirAngstrom * refractiveIndexFromVacuum(vac);
    const converged = Math.abs(next - vac) < 1e-10;
    vac = next;
    if (converged) break;
  }
  // Same threshold as vacuumToAir, decided on the vacuum side so the two invert each other.
  return vac < AIR_LIMIT_ANGSTROM ? lambdaAirAngstrom : vac;
}
