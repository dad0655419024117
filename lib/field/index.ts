// Public surface of lib/field: pure helpers the field app and the server share (the visit record,
// verdicts built with lib/combustion and lib/limits, submit checks, unit display). No framework code.
export * from './types';
export * from './verdict';
export * from './record';
export * from './submit';
export * from './units';
export { ENGINEER_DECLARATION } from './declaration';
