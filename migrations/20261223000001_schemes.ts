import type { Knex } from 'knex';

// Schemes: alternative structural layouts of one project's building. Every save is a new row in
// scheme_versions (never overwritten), holding the document as the engine reads it, the results
// the server computed from it and the engine version that computed them.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('schemes', (t) => {
    t.uuid('id').primary().defaultTo(knex.fn.uuid());
    t.uuid('firm_id').notNullable().references('firms.id').onDelete('RESTRICT');
    t.uuid('project_id').notNullable().references('projects.id').onDelete('CASCADE');
    t.text('name').notNullable();
    // The latest save; a save names the version it started from and is refused unless it matches.
    t.integer('current_version').notNullable().defaultTo(1);
    t.uuid('created_by').references('users.id').onDelete('SET NULL');
    t.timestamp('archived_at', { useTz: true });
    t.timestamps(true, true);
    t.index(['project_id', 'archived_at']);
  });
  await knex.raw(`alter table schemes add constraint schemes_name_length check (char_length(name) between 1 and 200)`);

  await knex.schema.createTable('scheme_versions', (t) => {
    t.uuid('scheme_id').notNullable().references('schemes.id').onDelete('CASCADE');
    t.integer('version').notNullable();
    t.integer('schema_version').notNullable();
    t.jsonb('document').notNullable();
    t.uuid('author_id').references('users.id').onDelete('SET NULL');
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    // Set when this save brought back an earlier one.
    t.integer('restored_from');
    t.jsonb('results').notNullable();
    t.text('engine_version').notNullable();
    // Counts kept beside the results so that lists need not read the whole results document.
    t.boolean('results_ok').notNullable();
    t.integer('error_count').notNullable();
    t.integer('warning_count').notNullable();
    t.primary(['scheme_id', 'version']);
  });
  await knex.raw(`alter table scheme_versions add constraint scheme_versions_version_positive check (version >= 1)`);
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('scheme_versions');
  await knex.schema.dropTable('schemes');
}
