/**
 * The engine's advice for one descent, in the sentences every output uses (the review screen,
 * the scenario report, the e-mails to safety officers). Figures are rounded toward safety (see
 * safety-rounding.ts), so a driver told "at or below 21 km/h" is within what the engine found.
 */
import type { Descent } from '../domain/analysis';
import { formatSafeSpeed, formatSocLimit, formatTemperatureLimit } from './safety-rounding';
import type { UnitSystem } from './units';

export type AdviceFacts = Pick<Descent, 'speedAdvice' | 'maxSafeSpeedKph' | 'maxTopSoc' | 'fadeThresholdC'> &
  Partial<Pick<Descent, 'maxTopSocReason' | 'fadeMarginK'>>;

export interface DescentAdvice {
  /** "Highest safe descent speed: 21 km/h". */
  speedHeadline: string;
  speedExplanation: string;
  /** "Highest battery charge (SOC) at the top: 87 %". */
  socHeadline: string;
  socExplanation: string;
  /** One line for tables and e-mails: "at or below 21 km/h; start at or below 87 % SOC". */
  short: string;
}

/** "50 K " (with the unit system's temperature difference) when a margin is known, else nothing. */
function marginText(marginK: number | undefined, system: UnitSystem): string {
  if (marginK === undefined || marginK <= 0) return '';
  const value = system === 'metric' ? marginK : marginK * 1.8;
  return `${Math.floor(value + 1e-9)} ${system === 'metric' ? 'K' : '°F'} `;
}

export function describeDescentAdvice(descent: AdviceFacts, system: UnitSystem): DescentAdvice {
  const fade = formatTemperatureLimit(descent.fadeThresholdC, system);
  let speedHeadline: string;
  let speedExplanation: string;
  let speedShort: string;
  switch (descent.speedAdvice) {
    case 'limit': {
      const speed = formatSafeSpeed(descent.maxSafeSpeedKph ?? 0, system);
      speedHeadline = `Highest safe descent speed: ${speed}`;
      speedShort = `descend at or below ${speed}`;
      speedExplanation =
        `Driven steadily at this speed or slower, the friction brakes stay ${marginText(descent.fadeMarginK, system)}below ${fade}, ` +
        'the temperature at which they start to fade (lose stopping power). Slower means less heat per second and more time to cool.';
      break;
    }
    case 'no-limit-needed':
      speedHeadline = 'No lower speed needed';
      speedShort = 'no lower descent speed needed for the brakes';
      speedExplanation = `At the posted speed limits the friction brakes already stay below the fade temperature (${fade}).`;
      break;
    case 'not-holdable':
      speedHeadline = 'No speed is slow enough';
      speedShort = 'no descent speed keeps the brakes below fade: an endurance brake or a vehicle restriction is needed';
      speedExplanation =
        `Even at walking pace the friction brakes pass ${fade} on this descent. A lower speed alone cannot make it safe: ` +
        'it needs more regeneration, a retarder, a lower battery charge at the top or a vehicle restriction.';
      break;
    case 'not-drivable':
      speedHeadline = 'No speed advice: not drivable as drawn';
      speedShort = 'no speed advice: part of the descent is not drivable as drawn';
      speedExplanation =
        'Part of this descent is steeper than the road design limit or the vehicle can climb or hold, or the vehicle ' +
        'would crawl for a long stretch. The model does not hold there, so it gives no speed. Check the route and the terrain.';
      break;
  }
  const soc = descent.maxTopSoc === null ? null : formatSocLimit(descent.maxTopSoc);
  let socHeadline: string;
  let socShort: string;
  let socExplanation: string;
  if (soc !== null) {
    socHeadline = `Highest battery charge (SOC) at the top: ${soc}`;
    socShort = `start the descent at or below ${soc} SOC`;
    socExplanation =
      'Regeneration turns braking energy back into battery charge, but a nearly full battery cannot take it. ' +
      'Start the descent at or below this state of charge (SOC, how full the battery is) so the motor does enough ' +
      `of the braking to keep the friction brakes ${marginText(descent.fadeMarginK, system)}below ${fade}.`;
  } else {
    switch (descent.maxTopSocReason) {
      case 'no-soc-keeps-brakes-cool':
        socHeadline = 'No battery charge is low enough';
        socShort = 'even an empty battery at the top leaves the brakes too hot';
        socExplanation =
          `Even starting the descent with an empty battery, the friction brakes pass ${marginText(descent.fadeMarginK, system)}` +
          `below ${fade}: regeneration alone cannot make this descent safe; see the speed advice.`;
        break;
      case 'no-battery':
        socHeadline = 'Battery charge plays no part';
        socShort = 'battery charge plays no part (overhead-line vehicle)';
        socExplanation =
          'The vehicle brakes into the overhead line, so the state of charge of any on-board battery does not change what regeneration takes.';
        break;
      case 'no-regeneration':
        socHeadline = 'Battery charge plays no part';
        socShort = 'battery charge plays no part (no regeneration)';
        socExplanation = 'The vehicle has no regenerative braking, so the state of charge does not change how hot the brakes get.';
        break;
      case 'not-drivable':
        socHeadline = 'No charge advice: not drivable as drawn';
        socShort = 'no charge advice: part of the descent is not drivable as drawn';
        socExplanation = 'Part of this descent is not drivable as drawn, so the model gives no advice for it.';
        break;
      default:
        // Results computed before the reason was recorded.
        socHeadline = 'Battery charge is not the limit';
        socShort = 'regeneration cannot take the whole descent at any state of charge';
        socExplanation =
          'At any state of charge, regeneration alone cannot take this whole descent (its power or a low speed limits it), ' +
          'so the friction brakes always share the work; see the speed advice.';
    }
  }
  return { speedHeadline, speedExplanation, socHeadline, socExplanation, short: `${speedShort}; ${socShort}` };
}
