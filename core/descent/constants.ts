/**
 * Physical constants used across core/descent. One source of truth per fact.
 */

/** Standard acceleration of gravity, m/s², exact by definition (3rd CGPM, 1901). Converts Isp in seconds to exhaust velocity. */
export const G0 = 9.80665;

export const DEG = Math.PI / 180;

/** Speed of light in vacuum, m/s, exact by the SI definition of the metre (17th CGPM, 1983). */
export const SPEED_OF_LIGHT = 299_792_458;

export type Vec3 = readonly [number, number, number];

export const norm3 = (v: Vec3): number => Math.hypot(v[0], v[1], v[2]);
export const sub3 = (a: Vec3, b: Vec3): Vec3 => [a[0] - b[0], a[1] - b[1], a[2] - b[2]];
export const add3 = (a: Vec3, b: Vec3): Vec3 => [a[0] + b[0], a[1] + b[1], a[2] + b[2]];
export const scale3 = (a: Vec3, s: number): Vec3 => [a[0] * s, a[1] * s, a[2] * s];
export const dot3 = (a: Vec3, b: Vec3): number => a[0] * b[0] + a[1] * b[1] + a[2] * b[2];
export const cross3 = (a: Vec3, b: Vec3): Vec3 => [
  a[1] * b[2] - a[2] * b[1],
  a[2] * b[0] - a[0] * b[2],
  a[0] * b[1] - a[1] * b[0],
];
