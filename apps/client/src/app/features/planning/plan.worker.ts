import { EngineMemo } from '@trabeate/structural';
import { EngineWarmUp, handlePlanRequest, type PlanRequest } from './plan-protocol';

// One worker serves one page, editing one scheme: its beam-line envelopes are kept between edits,
// and the engine is warmed up once the page has its first analysis (see EngineWarmUp).
const memo = new EngineMemo();
const warmUp = new EngineWarmUp();

addEventListener('message', (event: MessageEvent<PlanRequest>) => {
  warmUp.interrupt();
  const started = performance.now();
  for (const reply of handlePlanRequest(event.data, memo)) postMessage(reply);
  warmUp.answered(event.data, performance.now() - started);
});
