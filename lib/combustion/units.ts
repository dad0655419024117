import { TEMP_C_RANGE, TEMP_F_RANGE, requireInRange } from './guards';

// R in L·kPa/(mol·K): gives Vm = 24.465 L/mol at 25 °C and 101.325 kPa.
const GAS_CONSTANT = 8.314462618;
const ZERO_C_IN_K = 273.15;

const PPM_RANGE = { min: 0, max: 1_000_000 };
const MOLAR_MASS_RANGE = { min: 0, max: 1000, minExcluded: true };
// From high-altitude sites to well above any sample line's pressure.
const PRESSURE_KPA_RANGE = { min: 10, max: 1000 };

/** ppm (by volume) to mg/m3 for an ideal gas: ppm × M / Vm, with Vm from the temperature and pressure. */
export function ppmToMgPerM3(ppm: number, molarMassGPerMol: number, tempC = 25, pressureKPa = 101.325): number {
  const concentration = requireInRange('ppm', ppm, PPM_RANGE);
  const molarMass = requireInRange('molarMassGPerMol', molarMassGPerMol, MOLAR_MASS_RANGE);
  const temperature = requireInRange('tempC', tempC, TEMP_C_RANGE);
  const pressure = requireInRange('pressureKPa', pressureKPa, PRESSURE_KPA_RANGE);
  const molarVolumeL = (GAS_CONSTANT * (temperature + ZERO_C_IN_K)) / pressure;
  return (concentration * molarMass) / molarVolumeL;
}

/** °F to °C, limited to the same temperature range the analysis accepts. */
export function fToC(tempF: number): number {
  const f = requireInRange('tempF', tempF, TEMP_F_RANGE);
  return ((f - 32) * 5) / 9;
}

/** °C to °F, limited to the same temperature range the analysis accepts. */
export function cToF(tempC: number): number {
  const c = requireInRange('tempC', tempC, TEMP_C_RANGE);
  return (c * 9) / 5 + 32;
}
