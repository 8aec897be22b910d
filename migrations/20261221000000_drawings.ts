import type { Knex } from 'knex';

// The drawing register: drawings, their revisions and files, transmittals that issue them, and the
// log of every download. Issued revisions are frozen here in the database (triggers below), so no
// code path, seed or script can change or remove what has gone out to a client or a site.
const SHEET_SIZES = ['A0', 'A1', 'A2', 'A3', 'A4'];
const REVISION_STATES = ['draft', 'checked', 'approved', 'issued', 'superseded'];
const SERIES = ['preliminary', 'contractual'];
const SCHEMES = ['iso19650', 'letters_numbers'];
const OBJECT_TYPES = ['project', 'stage', 'deliverable', 'comment', 'membership'];
const NEW_OBJECT_TYPES = ['drawing', 'revision', 'transmittal'];
const list = (values: string[]) => values.map((v) => `'${v}'`).join(', ');

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('drawing_settings', (t) => {
    t.uuid('firm_id').primary().references('firms.id').onDelete('CASCADE');
    t.text('revision_scheme').notNullable().defaultTo('iso19650');
    t.text('number_pattern').notNullable().defaultTo('S-{seq:3}');
    t.timestamp('updated_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
  });
  await knex.raw(
    `alter table drawing_settings add constraint drawing_settings_scheme_known check (revision_scheme in (${list(SCHEMES)}))`,
  );

  await knex.schema.createTable('drawings', (t) => {
    t.uuid('id').primary().defaultTo(knex.fn.uuid());
    t.uuid('firm_id').notNullable().references('firms.id').onDelete('RESTRICT');
    t.uuid('project_id').notNullable().references('projects.id').onDelete('RESTRICT');
    t.text('number').notNullable();
    t.text('title').notNullable();
    t.text('stage_key').notNullable();
    t.text('sheet_size').notNullable();
    t.text('scale').notNullable();
    t.uuid('created_by').references('users.id').onDelete('SET NULL');
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.foreign(['project_id', 'stage_key']).references(['project_id', 'key']).inTable('stages').onDelete('RESTRICT');
  });
  await knex.raw('create unique index drawings_project_number on drawings (project_id, lower(number))');
  await knex.raw(
    `alter table drawings add constraint drawings_sheet_known check (sheet_size in (${list(SHEET_SIZES)}))`,
  );

  await knex.schema.createTable('drawing_revisions', (t) => {
    t.uuid('id').primary().defaultTo(knex.fn.uuid());
    t.uuid('drawing_id').notNullable().references('drawings.id').onDelete('RESTRICT');
    t.uuid('project_id').notNullable().references('projects.id').onDelete('RESTRICT');
    t.integer('seq').notNullable();
    t.text('series').notNullable();
    t.text('code').notNullable();
    t.text('suitability').notNullable();
    t.text('purpose').notNullable();
    t.text('description').notNullable().defaultTo('');
    t.date('revision_date').notNullable();
    t.text('state').notNullable().defaultTo('draft');
    t.uuid('drawn_by').notNullable().references('users.id').onDelete('RESTRICT');
    t.uuid('checked_by').references('users.id').onDelete('RESTRICT');
    t.uuid('approved_by').references('users.id').onDelete('RESTRICT');
    t.timestamp('checked_at', { useTz: true });
    t.timestamp('approved_at', { useTz: true });
    t.timestamp('issued_at', { useTz: true });
    t.timestamp('superseded_at', { useTz: true });
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.unique(['drawing_id', 'seq']);
    t.unique(['drawing_id', 'code']);
  });
  await knex.raw(
    `alter table drawing_revisions add constraint drawing_revisions_state_known check (state in (${list(REVISION_STATES)}))`,
  );
  await knex.raw(
    `alter table drawing_revisions add constraint drawing_revisions_series_known check (series in (${list(SERIES)}))`,
  );
  await knex.raw(
    `alter table drawing_revisions add constraint drawing_revisions_suitability_known check (suitability ~ '^(S[0-4]|A[1-9][0-9]{0,1}|CR)$')`,
  );
  // The one revision of a drawing that is still being worked on (a second one would race it to issue).
  await knex.raw(
    `create unique index drawing_revisions_one_open on drawing_revisions (drawing_id) where state in ('draft', 'checked', 'approved')`,
  );
  await knex.raw('create index drawing_revisions_project on drawing_revisions (project_id, state)');

  await knex.schema.createTable('revision_files', (t) => {
    t.uuid('id').primary().defaultTo(knex.fn.uuid());
    t.uuid('revision_id').notNullable().references('drawing_revisions.id').onDelete('RESTRICT');
    t.uuid('project_id').notNullable().references('projects.id').onDelete('RESTRICT');
    t.text('role').notNullable();
    t.text('file_name').notNullable();
    t.text('object_key').notNullable().unique();
    t.bigInteger('size_bytes').notNullable();
    t.specificType('sha256', 'char(64)').notNullable();
    t.text('content_type').notNullable();
    t.uuid('uploaded_by').notNullable().references('users.id').onDelete('RESTRICT');
    t.timestamp('uploaded_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
  });
  await knex.raw(
    `alter table revision_files add constraint revision_files_role_known check (role in ('pdf', 'source'))`,
  );
  await knex.raw(`create unique index revision_files_one_pdf on revision_files (revision_id) where role = 'pdf'`);

  // Issued and superseded revisions are frozen: the only change allowed is issued -> superseded.
  await knex.raw(`
    create function drawing_revisions_frozen() returns trigger language plpgsql as $$
    begin
      if tg_op = 'DELETE' then
        if old.state in ('issued', 'superseded') then
          raise exception 'revision % of an issued drawing cannot be deleted', old.code using errcode = '55000';
        end if;
        return old;
      end if;
      if old.state in ('issued', 'superseded') then
        if old.state = 'issued' and new.state = 'superseded' and new.superseded_at is not null
           and (to_jsonb(new) - 'state' - 'superseded_at') = (to_jsonb(old) - 'state' - 'superseded_at') then
          return new;
        end if;
        raise exception 'revision % has been issued and cannot be changed', old.code using errcode = '55000';
      end if;
      return new;
    end $$`);
  await knex.raw(`create trigger drawing_revisions_frozen before update or delete on drawing_revisions
    for each row execute function drawing_revisions_frozen()`);
  await knex.raw(`
    create function revision_files_frozen() returns trigger language plpgsql as $$
    declare
      st text;
    begin
      select state into st from drawing_revisions
        where id = (case when tg_op = 'INSERT' then new.revision_id else old.revision_id end);
      if st in ('issued', 'superseded') then
        raise exception 'the files of an issued revision cannot be changed' using errcode = '55000';
      end if;
      if tg_op = 'DELETE' then return old; end if;
      return new;
    end $$`);
  await knex.raw(`create trigger revision_files_frozen before insert or update or delete on revision_files
    for each row execute function revision_files_frozen()`);

  await knex.schema.createTable('transmittals', (t) => {
    t.uuid('id').primary().defaultTo(knex.fn.uuid());
    t.uuid('firm_id').notNullable().references('firms.id').onDelete('RESTRICT');
    t.uuid('project_id').notNullable().references('projects.id').onDelete('RESTRICT');
    t.integer('number').notNullable();
    t.text('purpose').notNullable();
    t.text('note').notNullable().defaultTo('');
    t.uuid('issued_by').notNullable().references('users.id').onDelete('RESTRICT');
    t.timestamp('issued_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp('links_expire_at', { useTz: true }).notNullable();
    t.text('sheet_object_key');
    t.bigInteger('sheet_size_bytes');
    t.unique(['project_id', 'number']);
  });
  await knex.schema.createTable('transmittal_items', (t) => {
    t.uuid('transmittal_id').notNullable().references('transmittals.id').onDelete('RESTRICT');
    t.uuid('revision_id').notNullable().references('drawing_revisions.id').onDelete('RESTRICT');
    t.integer('position').notNullable();
    t.primary(['transmittal_id', 'revision_id']);
  });
  await knex.schema.createTable('transmittal_recipients', (t) => {
    t.uuid('id').primary().defaultTo(knex.fn.uuid());
    t.uuid('transmittal_id').notNullable().references('transmittals.id').onDelete('RESTRICT');
    t.uuid('user_id').references('users.id').onDelete('RESTRICT');
    t.text('email').notNullable();
    t.text('name').notNullable().defaultTo('');
    t.timestamp('acknowledged_at', { useTz: true });
    t.index(['user_id']);
  });
  await knex.raw(
    'create unique index transmittal_recipients_email on transmittal_recipients (transmittal_id, lower(email))',
  );
  await knex.schema.createTable('drawing_downloads', (t) => {
    t.uuid('id').primary().defaultTo(knex.fn.uuid());
    t.uuid('project_id').notNullable().references('projects.id').onDelete('CASCADE');
    t.uuid('transmittal_id').references('transmittals.id').onDelete('CASCADE');
    t.uuid('revision_file_id').references('revision_files.id').onDelete('CASCADE');
    t.text('what').notNullable();
    t.uuid('user_id').references('users.id').onDelete('SET NULL');
    t.uuid('recipient_id').references('transmittal_recipients.id').onDelete('SET NULL');
    t.text('ip');
    t.timestamp('at', { useTz: true }).notNullable().defaultTo(knex.raw('clock_timestamp()'));
    t.index(['project_id', 'at']);
  });
  await knex.raw(
    `alter table drawing_downloads add constraint drawing_downloads_what_known check (what in ('file', 'zip', 'sheet'))`,
  );

  await knex.raw('alter table activity drop constraint activity_object_type_known');
  await knex.raw(
    `alter table activity add constraint activity_object_type_known check (object_type in (${list([...OBJECT_TYPES, ...NEW_OBJECT_TYPES])}))`,
  );
}

export async function down(knex: Knex): Promise<void> {
  await knex('activity').whereIn('object_type', NEW_OBJECT_TYPES).delete();
  await knex.raw('alter table activity drop constraint activity_object_type_known');
  await knex.raw(
    `alter table activity add constraint activity_object_type_known check (object_type in (${list(OBJECT_TYPES)}))`,
  );
  await knex.schema.dropTable('drawing_downloads');
  await knex.schema.dropTable('transmittal_recipients');
  await knex.schema.dropTable('transmittal_items');
  await knex.schema.dropTable('transmittals');
  await knex.raw('drop trigger if exists revision_files_frozen on revision_files');
  await knex.raw('drop trigger if exists drawing_revisions_frozen on drawing_revisions');
  await knex.schema.dropTable('revision_files');
  await knex.schema.dropTable('drawing_revisions');
  await knex.raw('drop function if exists revision_files_frozen()');
  await knex.raw('drop function if exists drawing_revisions_frozen()');
  await knex.schema.dropTable('drawings');
  await knex.schema.dropTable('drawing_settings');
}
