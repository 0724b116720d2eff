/**
 * A stand-in target evaluator with a known answer, for testing the footprint machinery (grid order,
 * threads, streaming, cancellation) apart from the descent solver: reachable inside a disc, propellant
 * growing with distance, time of flight recording the guess it was given.
 */
import { TARGET, type TargetOutcome } from '../../core/footprint/field.ts';
import type { TargetEvaluator } from '../../core/footprint/engine.ts';

export function discEvaluator(radius: number, delayMs = 0): TargetEvaluator {
  return (east, north, guess) => {
    if (delayMs > 0) {
      const until = Date.now() + delayMs;
      while (Date.now() < until) {
        /* busy wait: a stand-in for solver work */
      }
    }
    const d = Math.hypot(east, north);
    const reachable = d <= radius;
    const o: TargetOutcome = {
      code: reachable ? TARGET.reachable : TARGET.unreachable,
      propellant_kg: reachable ? 300 + d / 10 : NaN,
      // Encodes whether a guess arrived: 100 + d/100 when cold, guess + 0.001 when warm-started.
      timeOfFlight_s: reachable ? (guess === undefined ? 100 + d / 100 : guess + 0.001) : NaN,
      peakTilt_deg: 10,
      miss_m: reachable ? 0 : d - radius,
      solves: guess === undefined ? 10 : 3,
    };
    return o;
  };
}
