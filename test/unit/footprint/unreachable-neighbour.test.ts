/**
 * A target whose time-of-flight guess comes from a certified unreachable neighbour starts with the
 * minimum-landing-error search instead of a minimum-propellant probe at the guess. The outcome must not
 * change — the same certificate and closest approach, or, for a target back inside the reachable set,
 * the same minimum propellant — only the solves spent.
 */
import { describe, expect, it } from 'vitest';
import { descentEvaluator } from '../../../core/footprint/descentEvaluator.ts';
import { TARGET } from '../../../core/footprint/field.ts';
import { lowPropellantDemo } from '../../support/scenarios.ts';

describe('targets next to unreachable neighbours', () => {
  it('keep their outcome and spend fewer solves', () => {
    const { ctx } = lowPropellantDemo(20);
    // A neighbour's closest approach well outside the reachable set gives the guess.
    const probe = descentEvaluator(ctx)(3500, 3500, undefined);
    expect(probe.code).toBe(TARGET.unreachable);
    const guess = probe.timeOfFlight_s;
    let saved = 0;
    for (const [east, north] of [[3300, 3500], [3500, 3200], [3000, 3000], [0, 0]]) {
      const plain = descentEvaluator(ctx)(east, north, guess, false);
      const hinted = descentEvaluator(ctx)(east, north, guess, true);
      expect(hinted.code).toBe(plain.code);
      if (plain.code === TARGET.unreachable) {
        expect(Math.abs(hinted.miss_m - plain.miss_m)).toBeLessThan(1e-3 * (1 + plain.miss_m));
        expect(hinted.solves).toBeLessThan(plain.solves);
        saved += plain.solves - hinted.solves;
      } else {
        // The nominal target with a far-off guess: found again from the landing-error search's time of flight.
        expect(plain.code).toBe(TARGET.reachable);
        expect(Math.abs(hinted.propellant_kg - plain.propellant_kg)).toBeLessThan(0.06);
      }
    }
    expect(saved).toBeGreaterThanOrEqual(3);
  }, 120_000);
});
