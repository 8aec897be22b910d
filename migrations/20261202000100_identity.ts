import type { Knex } from 'knex';

// Tables of the local identity provider (apps/identity), kept apart from Trabeate's own: the API
// never reads them. Production points at another OpenID Connect provider and leaves them empty.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('identity_accounts', (t) => {
    t.uuid('id').primary().defaultTo(knex.fn.uuid());
    t.text('email').notNullable();
    t.text('name').notNullable();
    t.text('password_hash').notNullable();
    t.timestamps(true, true);
  });
  await knex.raw('create unique index identity_accounts_email_unique on identity_accounts (lower(email))');

  // oidc-provider's own records (sessions, interactions, codes, grants…), one row per model and id.
  await knex.schema.createTable('identity_payloads', (t) => {
    t.text('model').notNullable();
    t.text('id').notNullable();
    t.jsonb('payload').notNullable();
    t.text('grant_id');
    t.text('user_code');
    t.text('uid');
    t.timestamp('expires_at', { useTz: true });
    t.timestamp('consumed_at', { useTz: true });
    t.primary(['model', 'id']);
    t.index(['grant_id']);
    t.index(['uid']);
    t.index(['expires_at']);
  });

  // Signing keys and cookie secrets, generated at first start so every restart keeps them.
  await knex.schema.createTable('identity_secrets', (t) => {
    t.text('name').primary();
    t.jsonb('value').notNullable();
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('identity_secrets');
  await knex.schema.dropTable('identity_payloads');
  await knex.schema.dropTable('identity_accounts');
}
