import type { Knex } from 'knex';

// Outputs of a saved scheme version: calculation reports (made by a queued job, stored in S3)
// and the scheme version a drawing revision's plan sheet was drawn from. The revision columns are
// nullable (most revisions are uploaded by hand) and are written when the draft is inserted, so
// the trigger that freezes issued revisions never sees them change.
const REPORT_STATES = ['queued', 'running', 'done', 'failed'];

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('scheme_reports', (t) => {
    t.uuid('id').primary().defaultTo(knex.fn.uuid());
    t.uuid('firm_id').notNullable().references('firms.id').onDelete('RESTRICT');
    t.uuid('project_id').notNullable().references('projects.id').onDelete('RESTRICT');
    t.uuid('scheme_id').notNullable().references('schemes.id').onDelete('RESTRICT');
    t.integer('scheme_version').notNullable();
    t.text('state').notNullable().defaultTo('queued');
    t.integer('sections_done').notNullable().defaultTo(0);
    t.integer('sections_total').notNullable().defaultTo(0);
    t.text('stage_key');
    t.uuid('deliverable_id').references('deliverables.id').onDelete('SET NULL');
    t.text('object_key').unique();
    t.bigInteger('size_bytes');
    t.integer('pages');
    t.text('failure');
    t.uuid('requested_by').notNullable().references('users.id').onDelete('RESTRICT');
    t.timestamp('requested_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp('finished_at', { useTz: true });
    t.foreign(['scheme_id', 'scheme_version']).references(['scheme_id', 'version']).inTable('scheme_versions');
    t.index(['scheme_id', 'scheme_version']);
  });
  await knex.raw(
    `alter table scheme_reports add constraint scheme_reports_state_known check (state in (${REPORT_STATES.map((s) => `'${s}'`).join(', ')}))`,
  );
  await knex.schema.alterTable('drawing_revisions', (t) => {
    t.uuid('scheme_id').references('schemes.id').onDelete('RESTRICT');
    t.integer('scheme_version');
  });
  await knex.raw(
    'alter table drawing_revisions add constraint drawing_revisions_scheme_version_pair check ((scheme_id is null) = (scheme_version is null))',
  );
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('alter table drawing_revisions drop constraint drawing_revisions_scheme_version_pair');
  await knex.schema.alterTable('drawing_revisions', (t) => {
    t.dropColumn('scheme_version');
    t.dropColumn('scheme_id');
  });
  await knex.schema.dropTable('scheme_reports');
}
