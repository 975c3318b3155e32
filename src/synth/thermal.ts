/**
 * Thermal voltage from the exact SI 2019 constants. Part of the synthetic demo
 * generator for the invented "Larkspur Microsystems" kits (not a real process).
 */
export const BOLTZMANN = 1.380649e-23; // J/K, exact (SI 2019)
export const ELEMENTARY_CHARGE = 1.602176634e-19; // C, exact (SI 2019)
export const ZERO_CELSIUS = 273.15; // K
export const EPSILON_0 = 8.8541878128e-12; // F/m, CODATA 2018
export const EPS_SIO2 = 3.9; // relative permittivity of SiO2, common practice

/** UT = kT/q at a temperature in °C. */
export function thermalVoltage(celsius: number): number {
  return (BOLTZMANN * (celsius + ZERO_CELSIUS)) / ELEMENTARY_CHARGE;
}

/** Oxide capacitance per area for a SiO2-equivalent thickness, F/m². */
export function oxideCapacitance(tox: number): number {
  return (EPS_SIO2 * EPSILON_0) / tox;
}
