/**
 * Structural checks from RFC 7946 (The GeoJSON Format, IETF 2016) that a test can make: returns the list
 * of violations (empty when none). Section numbers beside each rule.
 */
type Json = Record<string, unknown>;

function signedArea(ring: number[][]): number {
  let a = 0;
  for (let k = 0; k + 1 < ring.length; k++) a += ring[k][0] * ring[k + 1][1] - ring[k + 1][0] * ring[k][1];
  return a / 2;
}

function checkPosition(p: unknown, where: string, out: string[]): void {
  // §3.1.1: a position is an array of two or more numbers, longitude first, then latitude (WGS 84, §4).
  if (!Array.isArray(p) || p.length < 2 || !p.every((v) => typeof v === 'number' && Number.isFinite(v))) {
    out.push(`${where}: position ${JSON.stringify(p)} is not an array of ≥ 2 finite numbers (§3.1.1)`);
    return;
  }
  if (Math.abs(p[0]) > 180 || Math.abs(p[1]) > 90) out.push(`${where}: [${p[0]}, ${p[1]}] is outside longitude ±180, latitude ±90 (§4)`);
}

function checkPolygon(rings: unknown, where: string, out: string[]): void {
  if (!Array.isArray(rings) || rings.length === 0) {
    out.push(`${where}: a Polygon needs at least one ring (§3.1.6)`);
    return;
  }
  rings.forEach((ring: number[][], k) => {
    const w = `${where} ring ${k}`;
    if (!Array.isArray(ring) || ring.length < 4) {
      out.push(`${w}: a linear ring has ≥ 4 positions (§3.1.6)`);
      return;
    }
    ring.forEach((p, i) => checkPosition(p, `${w}[${i}]`, out));
    const a = ring[0], b = ring[ring.length - 1];
    if (a[0] !== b[0] || a[1] !== b[1]) out.push(`${w}: not closed, first ${JSON.stringify(a)} ≠ last ${JSON.stringify(b)} (§3.1.6)`);
    // §3.1.6 right-hand rule: exterior counterclockwise (positive area), holes clockwise.
    const area = signedArea(ring);
    if (k === 0 && !(area > 0)) out.push(`${w}: exterior ring is not counterclockwise (area ${area}) (§3.1.6)`);
    if (k > 0 && !(area < 0)) out.push(`${w}: hole is not clockwise (area ${area}) (§3.1.6)`);
  });
}

function checkGeometry(g: unknown, where: string, out: string[]): void {
  if (g === null) return; // §3.2: an unlocated feature has a null geometry
  const geom = g as Json;
  if ('crs' in geom) out.push(`${where}: has a "crs" member (removed by §4)`);
  switch (geom.type) {
    case 'Point': checkPosition(geom.coordinates, where, out); break;
    case 'Polygon': checkPolygon(geom.coordinates, where, out); break;
    case 'MultiPolygon': (geom.coordinates as unknown[]).forEach((p, i) => checkPolygon(p, `${where} polygon ${i}`, out)); break;
    default: out.push(`${where}: geometry type ${String(geom.type)} not checked here`);
  }
}

export function rfc7946Violations(doc: unknown): string[] {
  const out: string[] = [];
  const fc = doc as Json;
  if (fc.type !== 'FeatureCollection' || !Array.isArray(fc.features)) return ['not a FeatureCollection with a features array (§3.3)'];
  if ('crs' in fc) out.push('FeatureCollection has a "crs" member (removed by §4)');
  (fc.features as Json[]).forEach((f, i) => {
    const where = `feature ${i}`;
    if (f.type !== 'Feature') out.push(`${where}: type is ${String(f.type)}, not "Feature" (§3.2)`);
    if (!('geometry' in f)) out.push(`${where}: no geometry member (§3.2)`);
    if (!('properties' in f)) out.push(`${where}: no properties member (§3.2)`);
    if ('crs' in f) out.push(`${where}: has a "crs" member (removed by §4)`);
    checkGeometry(f.geometry, where, out);
  });
  return out;
}
