import { z } from 'zod';

export const healthSchema = z.object({
  status: z.enum(['ok', 'degraded']),
  version: z.string(),
  uptimeSeconds: z.number().nonnegative(),
  database: z.object({
    status: z.enum(['up', 'down']),
    latencyMs: z.number().nonnegative().nullable(),
    message: z.string().optional(),
  }),
});
export type Health = z.infer<typeof healthSchema>;
