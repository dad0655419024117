// Names of the template databases scripts/pg-test.ts builds once per PostgreSQL run (one migrated,
// one migrated and seeded); freshDatabase() copies them. No imports: the runner script reads it too.
export const PG_TEMPLATE_MIGRATED = 'hearthmark_template_migrated';
export const PG_TEMPLATE_SEEDED = 'hearthmark_template_seeded';
