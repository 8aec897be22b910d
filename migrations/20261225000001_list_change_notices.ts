import type { Knex } from 'knex';

// Every change to what the projects list shows (projects, their stages, who is on them, client
// organisations' names) sends a notice on the channel `trabeate_changes` naming the firm, when its
// transaction commits (PostgreSQL sends one notice per firm per transaction). API processes listen
// (apps/server/src/core/change-feed.ts) and drop the list replies they keep for that firm. Triggers,
// so every writer (services, seeds, scripts, a second API process) is heard.

const TABLES: Array<[table: string, firm: (row: 'new' | 'old') => string]> = [
  ['projects', (r) => `${r}.firm_id`],
  ['client_organisations', (r) => `${r}.firm_id`],
  ['stages', (r) => `(select p.firm_id from projects p where p.id = ${r}.project_id)`],
  ['project_members', (r) => `(select p.firm_id from projects p where p.id = ${r}.project_id)`],
];

export async function up(knex: Knex): Promise<void> {
  for (const [table, firm] of TABLES) {
    // A row whose project is already gone (removed with it) names no firm: '*' drops every firm's.
    await knex.raw(`
      create function ${table}_change_notice() returns trigger language plpgsql as $$
      begin
        if tg_op <> 'INSERT' then
          perform pg_notify('trabeate_changes', coalesce(${firm('old')}::text, '*'));
        end if;
        if tg_op <> 'DELETE' then
          perform pg_notify('trabeate_changes', coalesce(${firm('new')}::text, '*'));
        end if;
        return null;
      end $$`);
    await knex.raw(`create trigger ${table}_change_notice after insert or update or delete on ${table}
      for each row execute function ${table}_change_notice()`);
  }
}

export async function down(knex: Knex): Promise<void> {
  for (const [table] of TABLES) {
    await knex.raw(`drop trigger if exists ${table}_change_notice on ${table}`);
    await knex.raw(`drop function if exists ${table}_change_notice()`);
  }
}
