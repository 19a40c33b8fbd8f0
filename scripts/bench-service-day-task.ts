/** Worker-thread task of scripts/bench-service-day.ts: one share of the blocks through the engine. */
import { runServiceDay, type ServiceDayEngineInput, type ServiceDayEngineResult } from '../shared/engine/service-day';

export default function run(input: ServiceDayEngineInput): ServiceDayEngineResult {
  return runServiceDay(input);
}
