import knex, { type Knex } from 'knex';
import { migrations } from '../../../../migrations';

export type Db = Knex;

type KnexLog = NonNullable<Knex.Config['log']>;

export function createDb(databaseUrl: string, poolMax = 10, log?: KnexLog): Db {
  return knex({
    client: 'pg',
    connection: databaseUrl,
    pool: { min: 0, max: poolMax },
    log,
    migrations: { migrationSource: new ListedMigrations() },
  });
}

/**
 * Migrations are listed in migrations/index.ts rather than read from the folder, so their recorded
 * names carry no extension and the same list runs from TypeScript (tsx, tests) and from the bundled
 * production build alike.
 */
class ListedMigrations implements Knex.MigrationSource<string> {
  getMigrations(): Promise<string[]> {
    return Promise.resolve(Object.keys(migrations).sort());
  }
  getMigrationName(name: string): string {
    return name;
  }
  getMigration(name: string): Promise<Knex.Migration> {
    return Promise.resolve(migrations[name]);
  }
}

export async function migrateLatest(db: Db): Promise<string[]> {
  const [, applied] = (await db.migrate.latest()) as [number, string[]];
  return applied;
}
