import type { Knex } from 'knex';

// Failed passwords per account at the local identity provider, shared by all its processes. The
// key is a hash of the normalised e-mail address, so addresses that match no account are throttled
// the same way (the wait reveals nothing) without keeping what strangers typed.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('identity_sign_in_failures', (t) => {
    t.text('account_key').primary();
    t.integer('failures').notNullable();
    t.timestamp('last_failed_at', { useTz: true }).notNullable();
    t.timestamp('wait_until', { useTz: true }).notNullable();
    t.index(['last_failed_at']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('identity_sign_in_failures');
}
