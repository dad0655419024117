/** Names of the inputs that can be rejected; they match the property names of the input objects. */
export type CombustionInputField =
  | 'input'
  | 'fuel'
  | 'coPpm'
  | 'co2Pct'
  | 'o2Pct'
  | 'co2MaxPct'
  | 'flueTempC'
  | 'airTempC'
  | 'moleFractions'
  | 'volume'
  | 'volumeUnit'
  | 'seconds'
  | 'calorificValue'
  | 'cvUnit'
  | 'ppm'
  | 'molarMassGPerMol'
  | 'tempC'
  | 'tempF'
  | 'pressureKPa';

/**
 * Thrown for any input the formulas cannot honestly use. Callers (forms, route handlers)
 * map `field` back to the offending input, so it must name the input exactly.
 */
export class CombustionInputError extends Error {
  override readonly name = 'CombustionInputError';
  readonly field: CombustionInputField;

  constructor(field: CombustionInputField, message: string) {
    super(message);
    this.field = field;
  }
}
