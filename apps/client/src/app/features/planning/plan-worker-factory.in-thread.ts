import { handlePlanRequest, type PlanWorkerPort } from './plan-protocol';

/** The worker's stand-in for Jest: the same handler, answered on a later task as a worker would. */
export function createPlanWorker(): PlanWorkerPort {
  let stopped = false;
  const port: PlanWorkerPort = {
    post: (request) => {
      // copied as postMessage would (jsdom has no structuredClone; the messages are plain JSON data),
      // so nothing is shared between the two sides by accident
      const copy = JSON.parse(JSON.stringify(request)) as typeof request;
      setTimeout(() => {
        // the replies in their order (an analysis: its checks, then its result)
        for (const reply of handlePlanRequest(copy)) if (!stopped) port.onReply?.(JSON.parse(JSON.stringify(reply)));
      });
    },
    onReply: null,
    terminate: () => {
      stopped = true;
    },
  };
  return port;
}
