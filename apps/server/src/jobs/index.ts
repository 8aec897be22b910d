export { createJobs, DEFAULT_MAIL_RETRY, MAIL_QUEUE } from './jobs';
export type { Jobs, JobsOptions, MailAttachment, MailJob, MailRequest, RetryPolicy } from './jobs';
