// Public surface of lib/exposure: what a measured room CO level means for the people breathing it.
// Pure and framework-free; the field app runs it offline.
export * from './cfk';
export * from './ambient';
export * from './estimate';
