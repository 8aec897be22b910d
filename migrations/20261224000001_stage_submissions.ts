import type { Knex } from 'knex';

// Every submission of a stage for review, kept as history. For the stages that rest on a scheme
// (Column layout, Beam framing, Foundations) it records the scheme version submitted, the check
// summary the server stored for that version and the engineer's justification for each
// error-level check left standing; the principal's decision is recorded on the same row, with the
// draft invoice that approval offered.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('stage_submissions', (t) => {
    t.uuid('id').primary().defaultTo(knex.fn.uuid());
    t.uuid('firm_id').notNullable().references('firms.id').onDelete('RESTRICT');
    t.uuid('project_id').notNullable();
    t.text('stage_key').notNullable();
    t.uuid('submitted_by').notNullable().references('users.id').onDelete('RESTRICT');
    t.timestamp('submitted_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.text('comment');
    t.uuid('scheme_id').references('schemes.id').onDelete('RESTRICT');
    t.integer('scheme_version');
    t.jsonb('check_summary');
    t.jsonb('justifications').notNullable().defaultTo('[]');
    t.text('decision');
    t.uuid('decided_by').references('users.id').onDelete('RESTRICT');
    t.timestamp('decided_at', { useTz: true });
    t.text('decision_comment');
    t.uuid('offered_invoice_id').references('invoices.id').onDelete('SET NULL');
    t.foreign(['project_id', 'stage_key']).references(['project_id', 'key']).inTable('stages').onDelete('CASCADE');
    t.foreign(['scheme_id', 'scheme_version']).references(['scheme_id', 'version']).inTable('scheme_versions');
    t.index(['project_id', 'stage_key', 'submitted_at']);
  });
  await knex.raw(
    `alter table stage_submissions add constraint stage_submissions_decision_known check (decision is null or decision in ('approved', 'returned'))`,
  );
  await knex.raw(
    `alter table stage_submissions add constraint stage_submissions_scheme_whole check ((scheme_id is null) = (scheme_version is null) and (scheme_id is null) = (check_summary is null))`,
  );
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('stage_submissions');
}
