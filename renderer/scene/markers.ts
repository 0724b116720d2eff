/**
 * Marker geometry: rings (nominal target), ellipses (landing dispersion), drop lines from a point
 * in the air to the ground below it (ignition point). Plain position arrays for THREE.Line objects.
 */
import { BufferAttribute, BufferGeometry } from 'three';

/**
 * Closed ellipse, `segments` + 1 points (last = first). `azimuth_deg` is the direction of the major
 * axis measured clockwise from north (the navigation convention). `heightAt` gives the scene z.
 */
export function ellipsePositions(
  centerEast_m: number,
  centerNorth_m: number,
  semiMajor_m: number,
  semiMinor_m: number,
  azimuth_deg: number,
  segments: number,
  heightAt: (east: number, north: number) => number,
): Float32Array {
  if (!(semiMajor_m > 0) || !(semiMinor_m > 0)) throw new Error(`invalid ellipse axes: ${semiMajor_m}, ${semiMinor_m} (must be positive metres)`);
  if (!Number.isInteger(segments) || segments < 8) throw new Error(`invalid segments: ${segments} (must be an integer ≥ 8)`);
  const az = (azimuth_deg * Math.PI) / 180;
  // Unit vector of the major axis in (east, north): clockwise from north.
  const ue = Math.sin(az);
  const un = Math.cos(az);
  const out = new Float32Array((segments + 1) * 3);
  for (let k = 0; k <= segments; k++) {
    const t = (2 * Math.PI * (k % segments)) / segments;
    const a = semiMajor_m * Math.cos(t);
    const b = semiMinor_m * Math.sin(t);
    // Minor axis is the major axis turned 90° clockwise: (un, −ue).
    const e = centerEast_m + a * ue + b * un;
    const n = centerNorth_m + a * un - b * ue;
    out.set([e, n, heightAt(e, n)], 3 * k);
  }
  return out;
}

export function ringPositions(centerEast_m: number, centerNorth_m: number, radius_m: number, segments: number, heightAt: (east: number, north: number) => number): Float32Array {
  return ellipsePositions(centerEast_m, centerNorth_m, radius_m, radius_m, 0, segments, heightAt);
}

export function lineGeometry(positions: Float32Array): BufferGeometry {
  const geometry = new BufferGeometry();
  geometry.setAttribute('position', new BufferAttribute(positions, 3));
  return geometry;
}

/** Vertical line from (east, north, z) down to the ground z below it. */
export function dropLinePositions(east: number, north: number, z: number, groundZ: number): Float32Array {
  return new Float32Array([east, north, z, east, north, groundZ]);
}
