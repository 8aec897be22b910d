import { z } from 'zod';

/**
 * One dependency as the health check saw it just now. `message` is in our own words (never the
 * driver's text, which can name hosts and users); the reason goes to the server log.
 */
export const dependencyHealthSchema = z.object({
  /** not_configured: this server was started without it (local runs and tests only). */
  status: z.enum(['up', 'down', 'not_configured']),
  latencyMs: z.number().nonnegative().nullable(),
  /** True when this dependency being down makes the whole API answer 503 (status "down"). */
  essential: z.boolean(),
  message: z.string().max(200).optional(),
});
export type DependencyHealth = z.infer<typeof dependencyHealthSchema>;

export const HEALTH_DEPENDENCIES = ['database', 'jobQueue', 'objectStorage', 'mailRelay'] as const;
export type HealthDependency = (typeof HEALTH_DEPENDENCIES)[number];

/**
 * GET /api/health. ok: every dependency up; degraded (HTTP 200): a non-essential one (object
 * storage, mail relay) is down; down (HTTP 503): an essential one (database, job queue) is down.
 */
export const healthSchema = z.object({
  status: z.enum(['ok', 'degraded', 'down']),
  version: z.string(),
  uptimeSeconds: z.number().nonnegative(),
  /**
   * When the dependencies were asked. Answers within a second or two of one another share one
   * check (the server's HEALTH_MAX_AGE_MS), so a busy health endpoint does not probe on every call.
   */
  checkedAt: z.iso.datetime().optional(),
  /** How old that check was when this answer was sent (ms). */
  ageMs: z.number().nonnegative().optional(),
  dependencies: z.object({
    database: dependencyHealthSchema,
    jobQueue: dependencyHealthSchema,
    objectStorage: dependencyHealthSchema,
    mailRelay: dependencyHealthSchema,
  }),
});
export type Health = z.infer<typeof healthSchema>;
