import type { PlanReply, PlanWorkerPort } from './plan-protocol';

/**
 * Starts the engine's worker. Jest cannot run `import.meta`, so its config maps this file to
 * plan-worker-factory.in-thread.ts, which answers in the same thread.
 */
export function createPlanWorker(): PlanWorkerPort {
  const worker = new Worker(new URL('./plan.worker', import.meta.url), { type: 'module' });
  const port: PlanWorkerPort = {
    post: (request) => worker.postMessage(request),
    onReply: null,
    terminate: () => worker.terminate(),
  };
  worker.addEventListener('message', (event: MessageEvent<PlanReply>) => port.onReply?.(event.data));
  return port;
}
