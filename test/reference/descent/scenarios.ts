/**
 * Our own descent scenarios for peer-library checks: invented vehicles at invented sites (no real
 * mission data). They exercise what the published examples do not: planet rotation on the Moon, a
 * speed limit, a minimum altitude, a pointing limit, a terminal gate and zero-order hold.
 */
import { DEG } from '../../../core/descent/constants.ts';
import { MOON_SIDEREAL_RATE, rotationAtLatitude } from '../../../core/descent/planet.ts';
import type { DescentSetup, IgnitionState } from '../../../core/descent/setup.ts';

export interface Scenario {
  name: string;
  setup: DescentSetup;
  ignition: IgnitionState;
  target: [number, number, number];
  /** A time of flight at which the fixed-time problem is feasible, s. */
  feasibleTime: number;
}

const invented = {
  wetMass: 2400, dryMass: 1700, isp: 311, engineCount: 4, thrustPerEngine: 2200, cantAngle: 10 * DEG,
  throttleMin: 0.25, throttleMax: 0.95, pointingLimit: 60 * DEG,
};

export const SCENARIOS: Scenario[] = [
  {
    name: 'invented lander, Moon at 40° N, gate and speed limit, FOH',
    setup: {
      planet: { name: 'Moon', gravity: [0, 0, -1.62], rotationRate: rotationAtLatitude(MOON_SIDEREAL_RATE, 40 * DEG) },
      vehicle: invented,
      constraints: { glideSlope: 8 * DEG, maxSpeed: 90, gateHeight: 30, gateDescentRate: 2, minAltitude: 20 },
      nodes: 40,
      hold: 'foh',
    },
    ignition: { position: [-1800, 600, 2200], velocity: [60, -10, -40], mass: 2400 },
    target: [150, -80, 12],
    feasibleTime: 70,
  },
  {
    name: 'invented lander, Moon, no glide slope, ZOH',
    setup: {
      planet: { name: 'Moon', gravity: [0, 0, -1.62], rotationRate: [0, 0, 0] },
      vehicle: { ...invented, pointingLimit: Math.PI },
      constraints: { glideSlope: null, maxSpeed: null, gateHeight: 0, gateDescentRate: 0, minAltitude: null },
      nodes: 30,
      hold: 'zoh',
    },
    ignition: { position: [2500, -400, 1800], velocity: [-50, 5, -30], mass: 2300 },
    target: [0, 0, 0],
    feasibleTime: 60,
  },
];
