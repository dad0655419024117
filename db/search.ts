import 'server-only';
// Case-insensitive "contains" search that behaves the same on SQLite and PostgreSQL. Both engines
// lower-case with lower(); the pattern is lower-cased here and its % _ \ escaped. The explicit
// ESCAPE clause matters: PostgreSQL escapes with \ by default, SQLite has no escape character unless told.
import type { Knex } from 'knex';

export function containsPattern(text: string): string {
  return `%${text.toLowerCase().replace(/[%_\\]/g, (c) => `\\${c}`)}%`;
}

/** Adds `(lower(col1) like … or lower(col2) like …)` to the query. Columns are identifiers, never user input. */
export function whereContains<T extends Knex.QueryBuilder>(query: T, columns: string[], text: string): T {
  const pattern = containsPattern(text);
  return query.andWhere((w) => {
    for (const column of columns) w.orWhereRaw("lower(??) like ? escape '\\'", [column, pattern]);
  }) as T;
}
