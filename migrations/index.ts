import type { Knex } from 'knex';
import * as m20261201000000 from './20261201000000_core';

/** Every migration, by name, in the order they run. Add new ones here as well as in the folder. */
export const migrations: Record<string, Knex.Migration> = {
  '20261201000000_core': m20261201000000,
};
