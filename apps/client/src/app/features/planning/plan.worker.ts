import { EngineMemo } from '@trabeate/structural';
import { handlePlanRequest, type PlanRequest } from './plan-protocol';

// One worker serves one page, editing one scheme: its beam-line envelopes are kept between edits.
const memo = new EngineMemo();

addEventListener('message', (event: MessageEvent<PlanRequest>) => {
  for (const reply of handlePlanRequest(event.data, memo)) postMessage(reply);
});
