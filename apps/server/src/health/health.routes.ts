import type { Request, RequestHandler } from 'express';
import type { DependencyHealth, Health, HealthDependency } from '@trabeate/contracts';
import type { Db } from '../db/db';
import type { Jobs } from '../jobs';
import type { ObjectStore } from '../storage';
import { probeSmtp, type MailRelayAddress } from './smtp-probe';

const startedAt = Date.now();

/** Each dependency gets this long; they are asked at once, so the whole check takes no longer. */
export const PROBE_TIMEOUT_MS = 1500;

/**
 * Which dependencies make the API "down" (503) when they are. Without PostgreSQL nothing works
 * (sessions, data); without its job queue a process cannot queue the notices its changes send.
 * Object storage and the mail relay are shared services outside the process: when one fails,
 * uploads answer 503 and mail waits in the queue, while everything else still works. Taking every
 * replica out of the load balancer for that would turn a partial outage into a full one, so they
 * make the API "degraded" (200) instead.
 */
export const ESSENTIAL: Record<HealthDependency, boolean> = {
  database: true,
  jobQueue: true,
  objectStorage: false,
  mailRelay: false,
};

const WHAT: Record<HealthDependency, string> = {
  database: 'The database',
  jobQueue: 'The job queue',
  objectStorage: 'File storage',
  mailRelay: 'The mail relay',
};

export interface HealthDeps {
  db: Db;
  version: string;
  store?: ObjectStore;
  jobs?: Jobs;
  mailRelay?: MailRelayAddress;
  /**
   * Answers within this long of a check reuse it (and requests arriving while a check runs wait
   * for it), so a load balancer, a monitor and a busy status page together cause one round of
   * probes per period rather than four connections per call. The reply states the check's time
   * and age. 0 asks afresh every time.
   */
  maxAgeMs?: number;
}

type Dependencies = Health['dependencies'];

/**
 * GET /api/health: the API and each dependency, probed at most once per `maxAgeMs` in this
 * process (several API processes run behind the load balancer; each checks its own
 * connections). 503 when an essential dependency is down, so a load balancer or container check
 * sees it; the body says which, and when it was checked.
 */
export function healthHandler({ db, version, store, jobs, mailRelay, maxAgeMs = 2000 }: HealthDeps): RequestHandler {
  let last: { at: number; dependencies: Promise<Dependencies> } | undefined;
  // The request that starts a check lends its logger to the check's failure lines.
  const checkAll = async (logger: Request['log'] | undefined): Promise<Dependencies> => {
    const check = (name: HealthDependency, probe: (() => Promise<unknown>) | undefined) =>
      probeOne(name, probe, (err) =>
        logger?.warn({ err, dependency: name }, `health check: ${WHAT[name].toLowerCase()} did not answer`),
      );
    const [database, jobQueue, objectStorage, mailRelayHealth] = await Promise.all([
      check('database', () => db.raw('select 1')),
      check('jobQueue', jobs && (() => jobs.probe())),
      check('objectStorage', store && (() => store.probe(PROBE_TIMEOUT_MS))),
      check('mailRelay', mailRelay && (() => probeSmtp(mailRelay, PROBE_TIMEOUT_MS))),
    ]);
    return { database, jobQueue, objectStorage, mailRelay: mailRelayHealth };
  };
  return async (req, res) => {
    const now = Date.now();
    if (!last || now - last.at >= maxAgeMs) {
      last = { at: now, dependencies: checkAll(req.log) };
    }
    const { at } = last;
    const dependencies = await last.dependencies;
    const down = (Object.keys(dependencies) as HealthDependency[]).filter((k) => dependencies[k].status === 'down');
    const status: Health['status'] = down.some((k) => ESSENTIAL[k]) ? 'down' : down.length > 0 ? 'degraded' : 'ok';
    const body: Health = {
      status,
      version,
      uptimeSeconds: Math.round((Date.now() - startedAt) / 1000),
      checkedAt: new Date(at).toISOString(),
      ageMs: Math.max(0, Date.now() - at),
      dependencies,
    };
    res.setHeader('Cache-Control', 'no-store');
    if (status === 'down') res.setHeader('Retry-After', '10');
    res.status(status === 'down' ? 503 : 200).json(body);
  };
}

async function probeOne(
  name: HealthDependency,
  probe: (() => Promise<unknown>) | undefined,
  logFailure: (err: unknown) => void,
): Promise<DependencyHealth> {
  const essential = ESSENTIAL[name];
  if (!probe) return { status: 'not_configured', latencyMs: null, essential, message: 'Not set up on this server.' };
  const t0 = performance.now();
  let timer: NodeJS.Timeout | undefined;
  try {
    await Promise.race([
      probe(),
      new Promise((_, reject) => {
        timer = setTimeout(() => reject(new DeadlineError()), PROBE_TIMEOUT_MS);
      }),
    ]);
    return { status: 'up', latencyMs: Math.round((performance.now() - t0) * 10) / 10, essential };
  } catch (err) {
    // The page is public: the reason (host, user, driver text) goes to the log, not to the caller.
    logFailure(err);
    return {
      status: 'down',
      latencyMs: null,
      essential,
      message:
        err instanceof DeadlineError || ['TimeoutError', 'AbortError'].includes((err as Error)?.name)
          ? `${WHAT[name]} did not answer within ${PROBE_TIMEOUT_MS / 1000} s.`
          : `${WHAT[name]} did not answer; the reason is in the server log.`,
    };
  } finally {
    clearTimeout(timer);
  }
}

class DeadlineError extends Error {
  constructor() {
    super('deadline passed');
    this.name = 'DeadlineError';
  }
}
