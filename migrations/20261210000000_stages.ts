import type { Knex } from 'knex';

// Design stages, their comment threads and deliverable files, and the activity log. Stage keys and
// states are checked here as well as in the API, so no path (a seed, a script) can store a wrong one.
const STAGE_KEYS = ['design_basis', 'column_layout', 'beam_framing', 'slab_panels', 'stairs', 'foundations'];
const STAGE_STATES = ['not_started', 'in_progress', 'under_review', 'returned', 'approved'];
const ACTIONS = ['start', 'submit', 'approve', 'return', 'reopen'];
const OBJECT_TYPES = ['project', 'stage', 'deliverable', 'comment', 'membership'];
const list = (values: string[]) => values.map((v) => `'${v}'`).join(', ');

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('projects', (t) => {
    t.uuid('created_by').references('users.id').onDelete('SET NULL');
  });
  await knex.raw('create index projects_firm_updated on projects (firm_id, updated_at desc)');
  await knex.raw('create index projects_firm_name on projects (firm_id, lower(name))');

  await knex.schema.createTable('stages', (t) => {
    t.uuid('project_id').notNullable().references('projects.id').onDelete('CASCADE');
    t.text('key').notNullable();
    t.smallint('position').notNullable();
    t.text('state').notNullable().defaultTo('not_started');
    t.uuid('assignee_id').references('users.id').onDelete('SET NULL');
    t.date('due_date');
    t.timestamp('started_at', { useTz: true });
    t.timestamp('submitted_at', { useTz: true });
    t.timestamp('approved_at', { useTz: true });
    t.timestamp('updated_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.primary(['project_id', 'key']);
    t.index(['assignee_id']);
  });
  await knex.raw(`alter table stages add constraint stages_key_known check (key in (${list(STAGE_KEYS)}))`);
  await knex.raw(`alter table stages add constraint stages_state_known check (state in (${list(STAGE_STATES)}))`);

  await knex.schema.createTable('stage_comments', (t) => {
    t.uuid('id').primary().defaultTo(knex.fn.uuid());
    t.uuid('project_id').notNullable();
    t.text('stage_key').notNullable();
    t.uuid('author_id').notNullable().references('users.id').onDelete('RESTRICT');
    t.text('body').notNullable();
    t.text('action');
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.foreign(['project_id', 'stage_key']).references(['project_id', 'key']).inTable('stages').onDelete('CASCADE');
    t.index(['project_id', 'stage_key', 'created_at']);
  });
  await knex.raw(
    `alter table stage_comments add constraint stage_comments_action_known check (action is null or action in (${list(ACTIONS)}))`,
  );

  // A re-upload under the same name is a new row with the next version; rows are never overwritten.
  await knex.schema.createTable('deliverables', (t) => {
    t.uuid('id').primary().defaultTo(knex.fn.uuid());
    t.uuid('project_id').notNullable();
    t.text('stage_key').notNullable();
    t.text('file_name').notNullable();
    t.integer('version').notNullable();
    t.text('object_key').notNullable().unique();
    t.bigInteger('size_bytes').notNullable();
    t.specificType('sha256', 'char(64)').notNullable();
    t.text('content_type').notNullable();
    t.text('detected_type').notNullable();
    t.uuid('uploaded_by').notNullable().references('users.id').onDelete('RESTRICT');
    t.timestamp('uploaded_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.foreign(['project_id', 'stage_key']).references(['project_id', 'key']).inTable('stages').onDelete('RESTRICT');
  });
  await knex.raw(
    'create unique index deliverables_name_version on deliverables (project_id, stage_key, lower(file_name), version)',
  );
  await knex.raw('alter table deliverables add constraint deliverables_version_positive check (version >= 1)');

  await knex.schema.createTable('activity', (t) => {
    t.uuid('id').primary().defaultTo(knex.fn.uuid());
    t.uuid('firm_id').notNullable().references('firms.id').onDelete('CASCADE');
    t.uuid('project_id').references('projects.id').onDelete('CASCADE');
    t.uuid('actor_id').references('users.id').onDelete('SET NULL');
    t.text('action').notNullable();
    t.text('object_type').notNullable();
    t.text('object_id').notNullable();
    t.text('stage_key');
    t.text('summary').notNullable();
    t.jsonb('details').notNullable().defaultTo('{}');
    // clock_timestamp, not now(): entries written in one transaction keep the order they were made in.
    t.timestamp('at', { useTz: true }).notNullable().defaultTo(knex.raw('clock_timestamp()'));
  });
  await knex.raw(
    `alter table activity add constraint activity_object_type_known check (object_type in (${list(OBJECT_TYPES)}))`,
  );
  await knex.raw('create index activity_project_at on activity (project_id, at desc, id desc)');

  // Projects made before stages existed get theirs, so every project has all six.
  await knex.raw(`insert into stages (project_id, key, position)
    select p.id, k.key, k.position from projects p
    cross join (values ${STAGE_KEYS.map((k, i) => `('${k}', ${i + 1})`).join(', ')}) as k(key, position)
    on conflict do nothing`);
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('activity');
  await knex.schema.dropTable('deliverables');
  await knex.schema.dropTable('stage_comments');
  await knex.schema.dropTable('stages');
  await knex.raw('drop index if exists projects_firm_name');
  await knex.raw('drop index if exists projects_firm_updated');
  await knex.schema.alterTable('projects', (t) => t.dropColumn('created_by'));
}
