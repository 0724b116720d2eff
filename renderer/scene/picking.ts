/**
 * Picking a ground point: cast the ray under the pointer through the camera and intersect it with
 * the terrain mesh. Pure three.js math (no renderer), so it is unit-tested in Node.
 */
import { Raycaster, Vector2, type Camera, type Mesh } from 'three';

export interface GroundPick {
  east_m: number;
  north_m: number;
  /** Terrain height at the pick, true scale (the mesh's exaggeration divided out). */
  height_m: number;
}

/** Normalised device coordinates of a pointer position inside an element's box. */
export function toNdc(clientX: number, clientY: number, rect: { left: number; top: number; width: number; height: number }): { x: number; y: number } {
  return { x: ((clientX - rect.left) / rect.width) * 2 - 1, y: 1 - ((clientY - rect.top) / rect.height) * 2 };
}

export function pickGround(terrain: Mesh, camera: Camera, ndc: { x: number; y: number }): GroundPick | null {
  const raycaster = new Raycaster();
  raycaster.setFromCamera(new Vector2(ndc.x, ndc.y), camera);
  const [hit] = raycaster.intersectObject(terrain, false);
  if (!hit) return null;
  const exaggeration = (terrain.geometry.userData?.exaggeration as number | undefined) ?? 1;
  return { east_m: hit.point.x, north_m: hit.point.y, height_m: hit.point.z / exaggeration };
}

/** A press-and-release counts as a click (not an orbit drag) when it moved less than this. */
export const CLICK_TOLERANCE_PX = 4;

export function isClick(down: { x: number; y: number }, up: { x: number; y: number }): boolean {
  return Math.hypot(up.x - down.x, up.y - down.y) < CLICK_TOLERANCE_PX;
}
