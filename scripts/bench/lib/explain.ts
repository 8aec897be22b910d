import type { Knex } from 'knex';

/**
 * Prints PostgreSQL's plan (EXPLAIN ANALYZE, BUFFERS) of every query each case sends, captured
 * from Knex's query events, so a bench can show where a request's database time goes.
 */
export async function explainQueries(
  db: Knex,
  title: string,
  cases: Array<[string, () => Promise<unknown>]>,
): Promise<void> {
  const captured: Array<{ sql: string; bindings: unknown[] }> = [];
  const onQuery = (q: { sql: string; bindings?: unknown[] }) =>
    captured.push({ sql: q.sql, bindings: q.bindings ?? [] });
  console.log(`\n${title} (EXPLAIN ANALYZE)`);
  for (const [name, call] of cases) {
    captured.length = 0;
    db.on('query', onQuery);
    try {
      await call();
    } finally {
      db.removeListener('query', onQuery);
    }
    for (const q of captured) {
      // The event carries PostgreSQL's numbered placeholders, in order; knex.raw takes "?".
      const sql = q.sql.replace(/\$\d+/g, '?');
      const plan = await db.raw(`explain (analyze, buffers) ${sql}`, q.bindings as readonly Knex.Value[]);
      console.log(`\n-- ${name}`);
      for (const row of plan.rows as Array<{ 'QUERY PLAN': string }>) console.log(row['QUERY PLAN']);
    }
  }
}
