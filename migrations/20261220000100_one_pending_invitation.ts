import type { Knex } from 'knex';

// One pending invitation per address and firm. The address is kept on the invitation itself so
// the database can hold the rule as a unique index; inviting the same address again resends that
// invitation's link instead of making a second one.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('invitations', (t) => {
    t.text('email');
  });
  await knex.raw('update invitations i set email = u.email from users u where u.id = i.user_id');
  // Earlier code could leave several pending invitations for one address: keep the newest.
  await knex.raw(`
    delete from invitations i
     where i.accepted_at is null
       and exists (select 1 from invitations j
                    where j.accepted_at is null and j.firm_id = i.firm_id
                      and lower(j.email) = lower(i.email)
                      and (j.created_at, j.id) > (i.created_at, i.id))`);
  await knex.raw('alter table invitations alter column email set not null');
  // Rows written without the address (older code, hand-made test rows) take their person's.
  await knex.raw(`
    create function invitations_fill_email() returns trigger language plpgsql as $$
    begin
      if new.email is null then
        select u.email into new.email from users u where u.id = new.user_id;
      end if;
      return new;
    end $$`);
  await knex.raw(
    'create trigger invitations_fill_email before insert on invitations for each row execute function invitations_fill_email()',
  );
  await knex.raw(
    'create unique index invitations_one_pending_per_address on invitations (firm_id, lower(email)) where accepted_at is null',
  );
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('drop index if exists invitations_one_pending_per_address');
  await knex.raw('drop trigger if exists invitations_fill_email on invitations');
  await knex.raw('drop function if exists invitations_fill_email()');
  await knex.schema.alterTable('invitations', (t) => {
    t.dropColumn('email');
  });
}
