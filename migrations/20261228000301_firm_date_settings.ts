import type { Knex } from 'knex';

// The firm's date language: the locale its dates are written in and the IANA zone its times are
// read in, on screen, in mail and on paper. Europe/London by default, the zone of the default
// locale's country (libs/dates DEFAULT_TIME_ZONE); the API checks both values against Intl.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('firms', (t) => {
    t.text('date_locale').notNullable().defaultTo('en-GB');
    t.text('time_zone').notNullable().defaultTo('Europe/London');
  });
  await knex.raw(`alter table firms
    add constraint firms_date_locale_length check (char_length(date_locale) between 2 and 35),
    add constraint firms_time_zone_length check (char_length(time_zone) between 1 and 64)`);
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('firms', (t) => {
    t.dropColumn('date_locale');
    t.dropColumn('time_zone');
  });
}
