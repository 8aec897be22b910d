import type { Knex } from 'knex';

// The paper a registered plan sheet was drawn on (ISO 216 size and the n of 1:n), kept with its
// revision so the server can draw the same sheet again when the revision is checked or approved,
// with the checker's and approver's names in its title panel. Written when the draft is inserted,
// like scheme_id and scheme_version, so the trigger that freezes issued revisions never sees them change.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('drawing_revisions', (t) => {
    t.text('sheet_size');
    t.integer('sheet_scale');
  });
  await knex.raw(
    'alter table drawing_revisions add constraint drawing_revisions_sheet_paper check ((sheet_size is null) = (sheet_scale is null) and (sheet_size is null or scheme_id is not null))',
  );
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('alter table drawing_revisions drop constraint drawing_revisions_sheet_paper');
  await knex.schema.alterTable('drawing_revisions', (t) => {
    t.dropColumn('sheet_scale');
    t.dropColumn('sheet_size');
  });
}
