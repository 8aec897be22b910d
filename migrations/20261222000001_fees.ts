import type { Knex } from 'knex';

// Fees, invoices, credit notes and payments. Every amount is a bigint of the currency's minor
// units; rates are basis points. Invoice numbers come from a counter row per firm, series and
// year, taken in the transaction that issues the invoice, so a rolled-back issue leaves no gap.
const list = (values: string[]) => values.map((v) => `'${v}'`).join(', ');
const STATES = ['draft', 'issued', 'part_paid', 'paid', 'void'];

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('fee_agreements', (t) => {
    t.uuid('project_id').primary().references('projects.id').onDelete('CASCADE');
    t.uuid('firm_id').notNullable().references('firms.id').onDelete('RESTRICT');
    t.text('basis').notNullable();
    t.bigInteger('lump_sum_minor');
    t.integer('percentage_bp');
    t.bigInteger('construction_cost_minor');
    t.specificType('currency', 'char(3)').notNullable();
    t.integer('tax_rate_bp').notNullable();
    t.text('tax_label').notNullable();
    t.integer('payment_terms_days').notNullable();
    t.uuid('billing_contact_id').notNullable().references('users.id').onDelete('RESTRICT');
    t.jsonb('stage_shares').notNullable();
    t.timestamps(true, true);
  });
  await knex.raw(
    `alter table fee_agreements add constraint fee_agreements_basis check (basis in ('lump_sum', 'percentage'))`,
  );

  await knex.schema.createTable('fee_variations', (t) => {
    t.uuid('id').primary().defaultTo(knex.fn.uuid());
    t.uuid('project_id').notNullable().references('fee_agreements.project_id').onDelete('CASCADE');
    t.bigInteger('amount_minor').notNullable();
    t.text('reason').notNullable();
    t.date('effective_on').notNullable();
    t.uuid('recorded_by').references('users.id').onDelete('SET NULL');
    t.timestamp('recorded_at', { useTz: true }).notNullable().defaultTo(knex.raw('clock_timestamp()'));
    t.index(['project_id', 'recorded_at']);
  });

  await knex.schema.createTable('invoice_counters', (t) => {
    t.uuid('firm_id').notNullable().references('firms.id').onDelete('CASCADE');
    t.text('series').notNullable();
    t.integer('year').notNullable();
    t.integer('last_number').notNullable().defaultTo(0);
    t.primary(['firm_id', 'series', 'year']);
  });

  await knex.schema.createTable('invoices', (t) => {
    t.uuid('id').primary().defaultTo(knex.fn.uuid());
    t.uuid('firm_id').notNullable().references('firms.id').onDelete('RESTRICT');
    t.uuid('project_id').notNullable().references('projects.id').onDelete('RESTRICT');
    t.text('kind').notNullable().defaultTo('invoice');
    t.uuid('credits_invoice_id').references('invoices.id').onDelete('RESTRICT');
    t.text('stage_key');
    t.text('state').notNullable().defaultTo('draft');
    t.text('series');
    t.integer('year');
    t.integer('seq');
    t.text('number');
    t.date('issued_on');
    t.date('due_on');
    t.specificType('currency', 'char(3)').notNullable();
    t.text('tax_label').notNullable();
    t.text('note').notNullable().defaultTo('');
    t.bigInteger('subtotal_minor').notNullable().defaultTo(0);
    t.bigInteger('tax_minor').notNullable().defaultTo(0);
    t.bigInteger('total_minor').notNullable().defaultTo(0);
    t.text('void_reason');
    t.timestamp('voided_at', { useTz: true });
    t.boolean('reminders_enabled').notNullable().defaultTo(true);
    t.text('pdf_object_key');
    t.uuid('created_by').references('users.id').onDelete('SET NULL');
    t.timestamps(true, true);
    t.unique(['firm_id', 'series', 'year', 'seq']);
    t.index(['project_id']);
  });
  await knex.raw(`alter table invoices add constraint invoices_state_known check (state in (${list(STATES)}))`);
  await knex.raw(`alter table invoices add constraint invoices_kind_known check (kind in ('invoice', 'credit_note'))`);
  // A draft has no number; an issued, part-paid or paid one always has (a voided draft never had one).
  await knex.raw(`alter table invoices add constraint invoices_numbered check (
    not (state = 'draft' and number is not null) and not (state in ('issued', 'part_paid', 'paid') and number is null))`);
  await knex.raw(`create unique index invoices_firm_number on invoices (firm_id, number) where number is not null`);
  // One open draft per stage: approving a stage twice (reopened in between) offers one draft.
  await knex.raw(
    `create unique index invoices_one_stage_draft on invoices (project_id, stage_key) where state = 'draft' and stage_key is not null`,
  );

  await knex.schema.createTable('invoice_lines', (t) => {
    t.uuid('id').primary().defaultTo(knex.fn.uuid());
    t.uuid('invoice_id').notNullable().references('invoices.id').onDelete('CASCADE');
    t.smallint('position').notNullable();
    t.text('kind').notNullable();
    t.text('description').notNullable();
    t.text('stage_key');
    t.bigInteger('net_minor').notNullable();
    t.integer('tax_rate_bp').notNullable();
    t.bigInteger('tax_minor').notNullable();
    t.unique(['invoice_id', 'position']);
  });

  await knex.schema.createTable('payments', (t) => {
    t.uuid('id').primary().defaultTo(knex.fn.uuid());
    t.uuid('firm_id').notNullable().references('firms.id').onDelete('RESTRICT');
    t.uuid('invoice_id').notNullable().references('invoices.id').onDelete('RESTRICT');
    t.text('method').notNullable();
    t.bigInteger('amount_minor').notNullable();
    t.bigInteger('overpaid_minor').notNullable().defaultTo(0);
    t.date('received_on').notNullable();
    t.text('reference').notNullable();
    // A card payment is recorded once per Checkout Session, however often it is reported.
    t.text('stripe_session_id').unique();
    t.uuid('recorded_by').references('users.id').onDelete('SET NULL');
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(['invoice_id']);
  });
  await knex.raw(
    `alter table payments add constraint payments_method_known check (method in ('bank_transfer', 'card'))`,
  );
  await knex.raw('alter table payments add constraint payments_positive check (amount_minor > 0)');

  await knex.schema.createTable('checkout_sessions', (t) => {
    t.text('id').primary();
    t.uuid('invoice_id').notNullable().references('invoices.id').onDelete('CASCADE');
    t.bigInteger('amount_minor').notNullable();
    t.specificType('currency', 'char(3)').notNullable();
    t.uuid('started_by').references('users.id').onDelete('SET NULL');
    t.text('outcome');
    t.text('outcome_message');
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
  });

  await knex.schema.createTable('stripe_events', (t) => {
    t.text('id').primary();
    t.text('type').notNullable();
    t.timestamp('received_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
  });

  await knex.schema.createTable('invoice_reminders', (t) => {
    t.uuid('invoice_id').notNullable().references('invoices.id').onDelete('CASCADE');
    t.integer('days_late').notNullable();
    t.timestamp('sent_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.primary(['invoice_id', 'days_late']);
  });
}

export async function down(knex: Knex): Promise<void> {
  for (const table of [
    'invoice_reminders',
    'stripe_events',
    'checkout_sessions',
    'payments',
    'invoice_lines',
    'invoices',
    'invoice_counters',
    'fee_variations',
    'fee_agreements',
  ])
    await knex.schema.dropTable(table);
}
