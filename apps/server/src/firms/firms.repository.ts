import type { FirmDateSettings } from '@trabeate/dates';
import type { Knex } from 'knex';
import type { Db } from '../db/db';

type Q = Db | Knex.Transaction;

/** A row carrying the firm's date columns (selected as f.date_locale, f.time_zone). */
export const datesOf = (row: { date_locale: string; time_zone: string }): FirmDateSettings => ({
  dateLocale: row.date_locale,
  timeZone: row.time_zone,
});

/** The firm's date language, as mails and PDFs write dates in it. */
export async function firmDates(q: Q, firmId: string): Promise<FirmDateSettings> {
  const row = await q('firms').where({ id: firmId }).first('date_locale', 'time_zone');
  if (!row) throw new Error(`firm ${firmId} not found`);
  return datesOf(row);
}

/**
 * SQL for today's date where the firm is (its time zone setting), for a firm id given as SQL
 * (a column, a bound parameter, a subquery): "late" and "overdue" turn at the firm's midnight,
 * not at the database server's.
 */
export const firmTodaySql = (firmId: string): string =>
  `(now() at time zone (select tz.time_zone from firms tz where tz.id = ${firmId}))::date`;

/**
 * Today's date (YYYY-MM-DD) where the firm is: an invoice issued at 02:00 in Kolkata is dated that
 * day, not the day before, which is still the date in UTC.
 */
export async function firmToday(q: Q, firmId: string): Promise<string> {
  const { rows } = await q.raw(
    `select to_char((now() at time zone f.time_zone)::date, 'YYYY-MM-DD') as today from firms f where f.id = ?`,
    [firmId],
  );
  if (!rows.length) throw new Error(`firm ${firmId} not found`);
  return rows[0].today as string;
}

export async function setFirmDates(q: Q, firmId: string, s: FirmDateSettings): Promise<FirmDateSettings> {
  await q('firms')
    .where({ id: firmId })
    .update({ date_locale: s.dateLocale, time_zone: s.timeZone, updated_at: q.fn.now() });
  return firmDates(q, firmId);
}
