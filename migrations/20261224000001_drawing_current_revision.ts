import type { Knex } from 'knex';

// Each drawing points at its current revision, so the register's first page joins drawings to one
// row each instead of looking up every drawing's newest revision on every request:
// - current_revision_id: the newest revision (highest seq), whatever its state: what the firm sees;
// - out_revision_id: the newest revision that went out (issued or superseded): what a client sees.
// The pointers are kept by triggers on drawing_revisions, in the same transaction as the insert,
// the state change or the removal of a draft that moves them. So every writer (the services, the
// demo seed, test helpers, scripts) keeps them right, and the freeze triggers on issued revisions
// are not involved: only the drawings row changes. The trigger locks the drawing row first and
// then reads, so two transactions registering or issuing revisions of one drawing take turns and
// the second one sees what the first committed.

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('drawings', (t) => {
    t.uuid('current_revision_id').references('drawing_revisions.id').onDelete('SET NULL');
    t.uuid('out_revision_id').references('drawing_revisions.id').onDelete('SET NULL');
  });

  await knex.raw(`
    create function drawing_revision_pointers() returns trigger language plpgsql as $$
    declare
      did uuid := case when tg_op = 'DELETE' then old.drawing_id else new.drawing_id end;
    begin
      perform 1 from drawings where id = did for update;
      update drawings d set
        current_revision_id = (select x.id from drawing_revisions x where x.drawing_id = did
                               order by x.seq desc limit 1),
        out_revision_id = (select x.id from drawing_revisions x where x.drawing_id = did
                           and x.state in ('issued', 'superseded') order by x.seq desc limit 1)
      where d.id = did;
      return null;
    end $$`);
  await knex.raw(`create trigger drawing_revision_pointers_rows after insert or delete on drawing_revisions
    for each row execute function drawing_revision_pointers()`);
  await knex.raw(`create trigger drawing_revision_pointers_state after update of state, seq on drawing_revisions
    for each row when (old.state is distinct from new.state or old.seq is distinct from new.seq)
    execute function drawing_revision_pointers()`);

  // Backfill: the same rule as the trigger, for every drawing already registered.
  await knex.raw(`
    update drawings d set
      current_revision_id = (select x.id from drawing_revisions x where x.drawing_id = d.id
                             order by x.seq desc limit 1),
      out_revision_id = (select x.id from drawing_revisions x where x.drawing_id = d.id
                         and x.state in ('issued', 'superseded') order by x.seq desc limit 1)`);

  // The register's default order (number, then id) within a project, and lookups by pointer.
  await knex.raw('create index drawings_register_order on drawings (project_id, lower(number), id)');
  await knex.raw('create index drawings_current_revision on drawings (current_revision_id)');
  await knex.raw('create index drawings_out_revision on drawings (out_revision_id)');
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('drop trigger if exists drawing_revision_pointers_state on drawing_revisions');
  await knex.raw('drop trigger if exists drawing_revision_pointers_rows on drawing_revisions');
  await knex.raw('drop function if exists drawing_revision_pointers()');
  await knex.raw('drop index if exists drawings_out_revision');
  await knex.raw('drop index if exists drawings_current_revision');
  await knex.raw('drop index if exists drawings_register_order');
  await knex.schema.alterTable('drawings', (t) => {
    t.dropColumn('out_revision_id');
    t.dropColumn('current_revision_id');
  });
}
