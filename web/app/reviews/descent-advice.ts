import type { ReviewItem } from '@shared/domain/reviews';
import { formatQuantity, type UnitSystem } from '../units/unit-format';

/** The engine's advice for one descent, as sentences a safety officer can pass on to drivers. */
export interface DescentAdvice {
  speedHeadline: string;
  speedExplanation: string;
  socHeadline: string;
  socExplanation: string;
}

export function describeDescentAdvice(item: ReviewItem, units: UnitSystem): DescentAdvice {
  const fade = formatQuantity('temperature', item.fadeThresholdC, units);
  let speedHeadline: string;
  let speedExplanation: string;
  switch (item.speedAdvice) {
    case 'limit':
      speedHeadline = `Highest safe descent speed: ${formatQuantity('speed', (item.maxSafeSpeedKph ?? 0) / 3.6, units)}`;
      speedExplanation =
        `Driven steadily at this speed or slower, the friction brakes stay below ${fade}, the temperature ` +
        'at which they start to fade (lose stopping power). Slower means less heat per second and more time to cool.';
      break;
    case 'no-limit-needed':
      speedHeadline = 'No lower speed needed';
      speedExplanation = `At the posted speed limits the friction brakes already stay below the fade temperature (${fade}).`;
      break;
    case 'not-holdable':
      speedHeadline = 'No speed is slow enough';
      speedExplanation =
        `Even at walking pace the friction brakes pass ${fade} on this descent. A lower speed alone cannot make it safe: ` +
        'it needs more regeneration, a retarder, a lower battery charge at the top or a vehicle restriction.';
      break;
  }
  const socHeadline =
    item.maxTopSoc === null
      ? 'Battery charge is not the limit'
      : `Highest battery charge (SOC) at the top: ${formatQuantity('soc', item.maxTopSoc, units)}`;
  const socExplanation =
    item.maxTopSoc === null
      ? 'At any state of charge, regeneration alone cannot take this whole descent (its power or a low speed limits it), ' +
        'so the friction brakes always share the work; see the speed advice.'
      : 'Regeneration turns braking energy back into battery charge, but a nearly full battery cannot take it. ' +
        'Start the descent at or below this state of charge (SOC, how full the battery is) and the motor can do ' +
        'the braking instead of the friction brakes.';
  return { speedHeadline, speedExplanation, socHeadline, socExplanation };
}
