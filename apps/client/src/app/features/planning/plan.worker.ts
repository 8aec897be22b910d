import { handlePlanRequest, type PlanRequest } from './plan-protocol';

addEventListener('message', (event: MessageEvent<PlanRequest>) => {
  postMessage(handlePlanRequest(event.data));
});
