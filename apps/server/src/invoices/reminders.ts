import type { Db } from '../db/db';
import type { Notices } from '../notices/notices';
import { formatMoney } from './money';
import { datesOf } from '../firms/firms.repository';
import { longDate } from './invoice-pdf';

export const REMINDER_JOB = 'invoices.overdue-reminders';
/** Once a day, early morning UTC. */
export const REMINDER_CRON = '15 6 * * *';
/** Days past the due date at which a reminder goes out (each once per invoice). */
export const DEFAULT_REMINDER_DAYS = [7, 14, 30];

/**
 * Queues the reminders that are due on `today`: for each open, overdue invoice with reminders on,
 * the latest step it has reached and not yet been sent. The (invoice, step) primary key makes a
 * second run, or a second API process, send nothing more.
 */
export async function sendOverdueReminders(
  db: Db,
  notices: Notices,
  today: string,
  steps: number[] = DEFAULT_REMINDER_DAYS,
): Promise<number> {
  const open = await db('invoices as i')
    .join('projects as p', 'p.id', 'i.project_id')
    .join('firms as f', 'f.id', 'i.firm_id')
    .join('fee_agreements as a', 'a.project_id', 'i.project_id')
    .join('users as u', 'u.id', 'a.billing_contact_id')
    .where('i.kind', 'invoice')
    .whereIn('i.state', ['issued', 'part_paid'])
    .where('i.reminders_enabled', true)
    .where('i.due_on', '<', db.raw('?::date', [today]))
    .select(
      'i.id',
      'i.number',
      'i.currency',
      'i.total_minor',
      db.raw(`to_char(i.due_on, 'YYYY-MM-DD') as due_on`),
      db.raw('(?::date - i.due_on) as days_late', [today]),
      'p.name as project_name',
      'f.name as firm_name',
      'f.date_locale',
      'f.time_zone',
      'u.display_name as contact_name',
      'u.email as contact_email',
    );
  let sent = 0;
  for (const inv of open) {
    const reached = steps.filter((d) => d <= Number(inv.days_late));
    if (!reached.length) continue;
    const step = Math.max(...reached);
    await db.transaction(async (trx) => {
      const claimed = await trx('invoice_reminders')
        .insert({ invoice_id: inv.id, days_late: step })
        .onConflict(['invoice_id', 'days_late'])
        .ignore()
        .returning('invoice_id');
      if (!claimed.length) return;
      const { rows } = await trx.raw(
        `select coalesce((select sum(amount_minor - overpaid_minor) from payments where invoice_id = :id), 0) as paid,
                coalesce((select sum(total_minor) from invoices where credits_invoice_id = :id and state <> 'void'), 0) as credited`,
        { id: inv.id },
      );
      const due = Number(inv.total_minor) - Number(rows[0].paid) - Number(rows[0].credited);
      await notices.send(trx, {
        to: inv.contact_email,
        template: 'invoice-overdue',
        data: {
          recipientName: inv.contact_name,
          firmName: inv.firm_name,
          projectName: inv.project_name,
          number: inv.number,
          due: formatMoney(due, inv.currency.trim()),
          dueOn: longDate(inv.due_on, datesOf(inv)),
          daysLate: Number(inv.days_late),
          link: notices.link('/fees'),
        },
      });
      sent += 1;
    });
  }
  return sent;
}
