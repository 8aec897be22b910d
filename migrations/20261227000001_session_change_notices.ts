import type { Knex } from 'knex';

// Notices for the sessions API processes keep (apps/server/src/auth/session-cache.ts), on the same
// channel as the list notices (`trabeate_changes`, see list_change_notices):
// - a session row changed or ended (idle expiry pushed, signed out, access removed): its bucket,
//   'session:' and the first two hex digits of md5(sid), so a touch drops one 256th of what a
//   process keeps, and the notice never carries the id itself;
// - a person, firm or client organisation changed or went (role, name, access): 'sessions', which
//   drops every kept session, since each carries its person with their firm's and organisation's
//   names.
// A new session row needs no notice: only rows read from the database are kept.

const EVERY_SESSION = ['users', 'firms', 'client_organisations'];

export async function up(knex: Knex): Promise<void> {
  await knex.raw(`
    create function sessions_change_notice() returns trigger language plpgsql as $$
    begin
      perform pg_notify('trabeate_changes', 'session:' || left(md5(old.sid), 2));
      return null;
    end $$`);
  await knex.raw(`create trigger sessions_change_notice after update or delete on sessions
    for each row execute function sessions_change_notice()`);
  await knex.raw(`
    create function every_session_change_notice() returns trigger language plpgsql as $$
    begin
      perform pg_notify('trabeate_changes', 'sessions');
      return null;
    end $$`);
  for (const table of EVERY_SESSION) {
    await knex.raw(`create trigger ${table}_session_notice after update or delete on ${table}
      for each statement execute function every_session_change_notice()`);
  }
}

export async function down(knex: Knex): Promise<void> {
  for (const table of EVERY_SESSION) await knex.raw(`drop trigger if exists ${table}_session_notice on ${table}`);
  await knex.raw('drop function if exists every_session_change_notice()');
  await knex.raw('drop trigger if exists sessions_change_notice on sessions');
  await knex.raw('drop function if exists sessions_change_notice()');
}
