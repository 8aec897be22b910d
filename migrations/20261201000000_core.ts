import type { Knex } from 'knex';

// The core tables later features extend: firms, the people in them, the client organisations
// they work for, and projects.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('firms', (t) => {
    t.uuid('id').primary().defaultTo(knex.fn.uuid());
    t.text('name').notNullable();
    t.text('slug').notNullable().unique();
    t.specificType('default_currency', 'char(3)').notNullable().defaultTo('EUR');
    t.timestamps(true, true);
  });

  await knex.schema.createTable('client_organisations', (t) => {
    t.uuid('id').primary().defaultTo(knex.fn.uuid());
    t.uuid('firm_id').notNullable().references('firms.id').onDelete('RESTRICT');
    t.text('name').notNullable();
    t.text('billing_email');
    t.text('address');
    t.timestamps(true, true);
    t.unique(['firm_id', 'name']);
  });

  await knex.schema.createTable('users', (t) => {
    t.uuid('id').primary().defaultTo(knex.fn.uuid());
    t.uuid('firm_id').notNullable().references('firms.id').onDelete('RESTRICT');
    t.text('email').notNullable();
    t.text('display_name').notNullable();
    // A person is either in the firm (principal or engineer) or a contact of a client organisation.
    t.enu('firm_role', ['principal', 'engineer'], { useNative: true, enumName: 'firm_role' });
    t.uuid('client_organisation_id').references('client_organisations.id').onDelete('RESTRICT');
    t.timestamp('disabled_at', { useTz: true });
    t.timestamps(true, true);
  });
  await knex.raw('create unique index users_firm_email_unique on users (firm_id, lower(email))');
  await knex.raw(`alter table users add constraint users_one_kind check (
    (firm_role is not null and client_organisation_id is null) or
    (firm_role is null and client_organisation_id is not null))`);

  await knex.schema.createTable('projects', (t) => {
    t.uuid('id').primary().defaultTo(knex.fn.uuid());
    t.uuid('firm_id').notNullable().references('firms.id').onDelete('RESTRICT');
    t.text('reference').notNullable();
    t.text('name').notNullable();
    t.uuid('client_organisation_id').notNullable().references('client_organisations.id').onDelete('RESTRICT');
    t.text('site_address').notNullable().defaultTo('');
    t.text('building_use').notNullable().defaultTo('');
    t.integer('storeys').notNullable().defaultTo(1);
    t.decimal('storey_height_m', 5, 2).notNullable().defaultTo(3.0);
    t.decimal('floor_area_m2', 10, 1);
    t.decimal('estimated_cost', 16, 2);
    t.specificType('currency', 'char(3)').notNullable().defaultTo('EUR');
    t.jsonb('design_basis').notNullable().defaultTo('{}');
    t.timestamp('archived_at', { useTz: true });
    t.timestamps(true, true);
    t.unique(['firm_id', 'reference']);
  });
  await knex.raw('alter table projects add constraint projects_storeys_positive check (storeys between 1 and 200)');
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('projects');
  await knex.schema.dropTable('users');
  await knex.raw('drop type if exists firm_role');
  await knex.schema.dropTable('client_organisations');
  await knex.schema.dropTable('firms');
}
