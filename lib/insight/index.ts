// Public surface of lib/insight: the appliance trend flag, diagnostic hints and the history payload.
// Pure and framework-free, so the field app can run it offline on cached history.
export * from './trend';
export * from './hints';
export * from './history';
export * from './csv';
