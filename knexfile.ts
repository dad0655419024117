// Knex configuration per environment, for tools that expect a knexfile. The app itself uses
// db/knex.ts; both build from db/config.ts. Edit db/config.ts, not this file.
import { knexConfig } from './db/config';
import { loadEnv } from './lib/env';

const settings = loadEnv();

const config = {
  development: knexConfig(settings),
  test: knexConfig({ DATABASE_FILE: 'data/test.db' }),
  production: knexConfig(settings),
};

export default config;
