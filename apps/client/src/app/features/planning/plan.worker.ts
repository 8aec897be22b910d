import { handlePlanRequest, type AnalyseRequest } from './plan-protocol';

addEventListener('message', (event: MessageEvent<AnalyseRequest>) => {
  postMessage(handlePlanRequest(event.data));
});
