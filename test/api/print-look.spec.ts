import { renderInvoicePdf, longDate, type InvoiceSheet } from '../../apps/server/src/invoices/invoice-pdf';
import { transmittalSheet } from '../../apps/server/src/drawings/transmittal-sheet';
import { renderMail } from '../../apps/server/src/mail';
import { DEFAULT_FIRM_DATES } from '@trabeate/dates';

// pdf-parse 1.1.1's index runs a debug self-test when required directly; its library file does not.
// eslint-disable-next-line @typescript-eslint/no-require-imports
const pdfParse = require('pdf-parse/lib/pdf-parse.js') as (b: Buffer) => Promise<{ text: string }>;

// Paper and mail write dates as the screens do (issue #14: one date format across the app,
// e-mails and PDFs: day, short month, year, "20 Dec 2026"; times 24-hour). These check the
// rendered documents, not the formatter: a sheet that kept its own "20 December 2026" or an ISO
// date would fail here.

const sheet: InvoiceSheet = {
  kind: 'invoice',
  number: 'INV-2026-0042',
  issuedOn: '2026-12-20',
  dueOn: '2027-01-19',
  currency: 'EUR',
  firm: { name: 'Sable Quay Structural' },
  dates: DEFAULT_FIRM_DATES,
  client: { name: 'Fenwick Row Developments', address: null, contactName: 'Odile Marchetti' },
  project: { reference: 'SQ-2026-014', name: 'Kestrel Yard apartments' },
  lines: [
    { description: 'Column layout', stageKey: 'column_layout', netMinor: 480_000, taxRateBp: 2000, taxMinor: 96_000 },
  ],
  taxLabel: 'VAT',
  subtotalMinor: 480_000,
  taxMinor: 96_000,
  totalMinor: 576_000,
  paymentReference: 'INV-2026-0042',
};

describe('dates on paper and in mail', () => {
  it('an invoice PDF writes its issue and due dates as "20 Dec 2026", in the figures face for amounts', async () => {
    const pdf = await renderInvoicePdf(sheet);
    const text = (await pdfParse(pdf)).text;
    expect(text).toContain('Issued: 20 Dec 2026');
    expect(text).toContain('Due: 19 Jan 2027');
    expect(text).toContain('quoting INV-2026-0042 by 19 Jan 2027');
    expect(text).not.toMatch(/December|January|2026-12-20|20\/12\/2026/);
    // Amounts use the fixed-width figures face (embedded by name), so columns of money line up.
    expect(pdf.toString('latin1')).toMatch(/JetBrainsMono/);
  });

  const transmittal = (dates = DEFAULT_FIRM_DATES, issuedAt = new Date(Date.UTC(2026, 11, 1, 9, 5))) =>
    transmittalSheet({
      firmName: 'Sable Quay Structural',
      dates,
      projectReference: 'SQ-2026-014',
      projectName: 'Kestrel Yard apartments',
      reference: 'SQ-2026-014-TR-001',
      purpose: 'information',
      note: '',
      issuedBy: 'Mira Sollen',
      issuedAt,
      recipients: [{ name: 'Odile Marchetti', email: 'odile.marchetti@fenwickrow.example' }],
      items: [
        {
          number: 'SQ-S-100',
          title: 'Ground floor columns',
          code: 'P02',
          suitability: 'S2',
          purpose: 'information',
          date: '2026-11-28',
        },
      ],
    });

  it('a transmittal sheet writes the issue time in the firm zone, named, and item dates as days', async () => {
    // Europe/London keeps GMT (UTC+0) in December: UK civil time, GMT from the last Sunday of October.
    const text = (await pdfParse(await transmittal())).text;
    expect(text).toContain('1 Dec 2026, 09:05 GMT');
    expect(text).toContain('28 Nov 2026');
    expect(text).not.toMatch(/2026-11-28|November/);
  });

  it("a firm in Kolkata sees an evening issue in UTC as the next morning, its locale's day and zone name", async () => {
    // India Standard Time is UTC+5:30 all year (IANA tz database, Asia/Kolkata): 20:00 UTC is 01:30 the next day.
    const late = new Date(Date.UTC(2026, 11, 1, 20, 0));
    const india = (await pdfParse(await transmittal({ dateLocale: 'en-IN', timeZone: 'Asia/Kolkata' }, late))).text;
    expect(india).toContain('2 Dec 2026, 01:30 IST');
    // A calendar day (the revision's date) is that day everywhere: no zone moves it.
    expect(india).toContain('28 Nov 2026');
    const berlin = (await pdfParse(await transmittal({ dateLocale: 'de-DE', timeZone: 'Europe/Berlin' }, late))).text;
    // Central European Time is UTC+1 in winter; German short month names end with a full stop.
    expect(berlin).toContain('1. Dez. 2026, 21:00');
  });

  it('an invoice writes its dates in the firm locale', async () => {
    const text = (
      await pdfParse(await renderInvoicePdf({ ...sheet, dates: { dateLocale: 'de-DE', timeZone: 'Europe/Berlin' } }))
    ).text;
    expect(text).toContain('Issued: 20. Dez. 2026');
    expect(text).toContain('Due: 19. Jan. 2027');
  });

  it('the invoice e-mail states the due date as the invoice and the screens do, in the app type', () => {
    const m = renderMail('invoice-issued', {
      recipientName: 'Odile Marchetti',
      firmName: 'Sable Quay Structural',
      projectName: 'Kestrel Yard apartments',
      number: 'INV-2026-0042',
      total: '€5,760.00',
      // What invoices.service passes: the due date through the invoices' one day formatter.
      dueOn: longDate(sheet.dueOn, DEFAULT_FIRM_DATES),
      link: 'http://127.0.0.1:4200/fees',
    });
    expect(m.text).toContain('due on 19 Jan 2027');
    expect(m.html).toContain('due on 19 Jan 2027');
    // The app's typeface first, and figures of equal width for amounts and dates.
    expect(m.html).toMatch(/font-family:'Atkinson Hyperlegible'/);
    expect(m.html).toContain('font-variant-numeric:tabular-nums');
  });
});
