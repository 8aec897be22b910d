// Trabeate's one date and time language, shared by the client, the e-mails and PDFs. A library of
// its own (not in contracts) so the browser bundle takes these few functions without zod.
export * from './dates';
