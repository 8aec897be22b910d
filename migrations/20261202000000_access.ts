import type { Knex } from 'knex';

// Sign-in and access: who a person is at the identity provider, which projects they belong to,
// pending invitations, the shared session store and the shared sign-in rate limit.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('users', (t) => {
    // The identity provider's issuer and subject, bound at the first sign-in with the user's e-mail.
    t.text('oidc_issuer');
    t.text('oidc_subject');
    t.timestamp('last_signed_in_at', { useTz: true });
  });
  await knex.raw(
    'create unique index users_oidc_identity_unique on users (oidc_issuer, oidc_subject) where oidc_subject is not null',
  );

  // For an engineer a membership is an assignment; for a client contact it is a project they may see.
  await knex.schema.createTable('project_members', (t) => {
    t.uuid('project_id').notNullable().references('projects.id').onDelete('CASCADE');
    t.uuid('user_id').notNullable().references('users.id').onDelete('CASCADE');
    t.uuid('added_by').references('users.id').onDelete('SET NULL');
    t.timestamp('added_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.primary(['project_id', 'user_id']);
    t.index(['user_id']);
  });

  await knex.schema.createTable('invitations', (t) => {
    t.uuid('id').primary().defaultTo(knex.fn.uuid());
    t.uuid('firm_id').notNullable().references('firms.id').onDelete('CASCADE');
    t.uuid('user_id').notNullable().references('users.id').onDelete('CASCADE');
    // Only a hash of the token is kept: the link is shown once, to the principal who made it.
    t.text('token_hash').notNullable().unique();
    t.uuid('invited_by').references('users.id').onDelete('SET NULL');
    t.timestamp('expires_at', { useTz: true }).notNullable();
    t.timestamp('accepted_at', { useTz: true });
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(['user_id']);
  });

  // connect-pg-simple's table layout, so every API process shares the same sessions.
  await knex.schema.createTable('sessions', (t) => {
    t.string('sid').primary();
    t.json('sess').notNullable();
    t.timestamp('expire', { precision: 6 }).notNullable();
    t.index(['expire']);
  });
  await knex.raw(`create index sessions_user_id on sessions (((sess::jsonb -> 'auth') ->> 'userId'))`);

  await knex.schema.createTable('rate_limits', (t) => {
    t.text('key').primary();
    t.integer('hits').notNullable();
    t.timestamp('reset_at', { useTz: true }).notNullable();
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('rate_limits');
  await knex.schema.dropTable('sessions');
  await knex.schema.dropTable('invitations');
  await knex.schema.dropTable('project_members');
  await knex.raw('drop index if exists users_oidc_identity_unique');
  await knex.schema.alterTable('users', (t) => {
    t.dropColumn('oidc_issuer');
    t.dropColumn('oidc_subject');
    t.dropColumn('last_signed_in_at');
  });
}
