/**
 * The Mars powered-descent examples of Açıkmeşe & Ploen (2007, JGCD 30(5)) and Blackmore, Açıkmeşe &
 * Scharf (2010, JGCD 33(4)), rewritten in our surface frame.
 *
 * The papers' frame has x up, then cross-range y, then downrange z. Ours is x (downrange here), y, z up.
 * Mapping (x_p, y_p, z_p) → (z_p, −y_p, x_p) keeps the frame right-handed (a plain swap of x and z
 * would mirror it, which matters once the planet's rotation enters).
 * Parameters as quoted in the issue brief (second-hand, not read from the papers here):
 * g = 3.7114 m/s², wet 1905 kg, dry 1505 kg, Isp 225 s, 6 × 3100 N at 27° cant, throttle 0.3–0.8,
 * glide slope 4°, r0 = (1500, 0, 2000) m and ṙ0 = (−75, 0, 100) m/s in the papers' frame.
 * Blackmore 2010 adds the Mars rotation ω = (2.53e-5, 0, 6.62e-5) rad/s in the papers' frame (from
 * memory: its magnitude, 7.09e-5 rad/s, is Mars' sidereal rate, a sanity check) and offsets r0 by
 * 500 m cross-range (case 1); case 2 adds 40 m/s cross-range velocity.
 */
import { DEG } from '../../../core/descent/constants.ts';
import type { Vec3 } from '../../../core/descent/constants.ts';
import type { DescentSetup, IgnitionState } from '../../../core/descent/setup.ts';

export const fromPaperFrame = (v: Vec3): Vec3 => [v[2], -v[1], v[0]];

export function marsSetup(opts: { glideSlope: boolean; rotation: boolean; nodes?: number; hold?: 'zoh' | 'foh' }): DescentSetup {
  return {
    planet: {
      name: 'Mars (paper example)',
      gravity: fromPaperFrame([-3.7114, 0, 0]),
      rotationRate: opts.rotation ? fromPaperFrame([2.53e-5, 0, 6.62e-5]) : [0, 0, 0],
    },
    vehicle: {
      wetMass: 1905, dryMass: 1505, isp: 225, engineCount: 6, thrustPerEngine: 3100, cantAngle: 27 * DEG,
      throttleMin: 0.3, throttleMax: 0.8, pointingLimit: Math.PI,
    },
    constraints: { glideSlope: opts.glideSlope ? 4 * DEG : null, maxSpeed: null, gateHeight: 0, gateDescentRate: 0, minAltitude: null },
    nodes: opts.nodes ?? 50,
    hold: opts.hold ?? 'foh',
  };
}

export function marsIgnition(paperR0: Vec3, paperV0: Vec3): IgnitionState {
  return { position: fromPaperFrame(paperR0), velocity: fromPaperFrame(paperV0), mass: 1905 };
}

export const ACIKMESE_2007 = marsIgnition([1500, 0, 2000], [-75, 0, 100]);
export const BLACKMORE_2010_CASE_1 = marsIgnition([1500, 500, 2000], [-75, 0, 100]);
export const BLACKMORE_2010_CASE_2 = marsIgnition([1500, 500, 2000], [-75, 40, 100]);
