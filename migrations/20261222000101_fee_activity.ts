import type { Knex } from 'knex';

// Fee actions (agreements, invoices, payments) go in the activity log as well. The check is
// dropped and re-added with the full list, so widening it again later is one more such step.
const BEFORE = ['project', 'stage', 'deliverable', 'comment', 'membership', 'drawing', 'revision', 'transmittal'];
const AFTER = [...BEFORE, 'fee_agreement', 'invoice', 'payment'];
const list = (values: string[]) => values.map((v) => `'${v}'`).join(', ');

export async function up(knex: Knex): Promise<void> {
  await knex.raw('alter table activity drop constraint activity_object_type_known');
  await knex.raw(
    `alter table activity add constraint activity_object_type_known check (object_type in (${list(AFTER)}))`,
  );
  // The webhook looks a session up by id; the return page by invoice.
  await knex.raw('create index checkout_sessions_invoice on checkout_sessions (invoice_id)');
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('drop index checkout_sessions_invoice');
  await knex.raw(`delete from activity where object_type not in (${list(BEFORE)})`);
  await knex.raw('alter table activity drop constraint activity_object_type_known');
  await knex.raw(
    `alter table activity add constraint activity_object_type_known check (object_type in (${list(BEFORE)}))`,
  );
}
