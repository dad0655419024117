// Stands in for the 'server-only' marker package under vitest, which runs server modules directly.
export {};
