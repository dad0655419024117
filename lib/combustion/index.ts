// Combustion arithmetic for flue-gas analysis and meter tests. Pure: no framework, I/O or
// environment, so it runs the same in the browser, on the server and in a plain Node script.
export { CombustionInputError, type CombustionInputField } from './errors';
export {
  FUEL_IDS,
  FUEL_LABELS,
  isFuelId,
  co2MaxForFuel,
  co2MaxFromComposition,
  type FuelId,
  type GasSpecies,
  type MoleFractions,
} from './fuels';
export {
  coCo2Ratio,
  airFreeCoFromO2,
  airFreeCoFromCo2,
  co2FromO2,
  lambdaFromO2,
  excessAirPct,
  flueLossPct,
  type FlueLossInput,
} from './flue-gas';
export {
  analyseFlueGas,
  type FlueGasAnalysis,
  type FlueGasInput,
  type FlueGasWarning,
  type FlueGasWarningCode,
} from './analyse';
export {
  heatInputKw,
  type CalorificValueUnit,
  type HeatInputInput,
  type HeatInputResult,
  type VolumeUnit,
} from './heat-input';
export { ppmToMgPerM3, fToC, cToF } from './units';
