/**
 * The footprint as a stand-alone SVG figure for reports: propellant-cost bands, the reserve boundary,
 * the nominal target, an optional landing ellipse, metre-ticked axes, scale bar, north arrow, legend and a
 * caption with provenance and the caution. Pure string output.
 */
import type { Position } from 'geojson';
import type { Ellipse } from '../footprint/ellipse.ts';
import { niceStep, regionBounds, type PropellantRegion } from '../footprint/contours.ts';
import type { FootprintField } from '../footprint/field.ts';
import type { FootprintFigures } from '../footprint/studyFootprint.ts';
import { sampleColormap, VIRIDIS } from '../study/colormap.ts';
import { CAUTION } from '../study/provenance.ts';

export type Colormap = (t: number) => readonly [number, number, number];

export interface FootprintSvgInput {
  title: string;
  /** [west, south, east, north] of the map, m. */
  bounds_m: readonly [number, number, number, number];
  /** Bands {propellant ≤ level}, ascending levels. */
  bands: PropellantRegion[];
  reachable: PropellantRegion;
  budget_kg: number;
  colormap: Colormap;
  ellipse?: Ellipse | null;
  /** Guaranteed divert radius around the nominal target, m (drawn as a dotted circle when > 0). */
  divertRadius_m?: number;
  caption: string[];
  width_px?: number;
}

const esc = (s: string) => s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');

function hex([r, g, b]: readonly [number, number, number]): string {
  const c = (v: number) => Math.round(Math.max(0, Math.min(1, v)) * 255).toString(16).padStart(2, '0');
  return `#${c(r)}${c(g)}${c(b)}`;
}

function wrap(text: string, width: number): string[] {
  const out: string[] = [];
  let line = '';
  for (const word of text.split(' ')) {
    if (line && line.length + 1 + word.length > width) {
      out.push(line);
      line = word;
    } else line = line ? `${line} ${word}` : word;
  }
  if (line) out.push(line);
  return out;
}

export function footprintSvg(input: FootprintSvgInput): string {
  const W = input.width_px ?? 760;
  const [w, s, e, n] = input.bounds_m;
  const margin = { left: 70, right: 150, top: 40, bottom: 60 };
  const mapW = W - margin.left - margin.right;
  const scale = mapW / (e - w);
  const mapH = (n - s) * scale;
  const captionH = 16 * (input.caption.length + 2) + 28;
  const H = margin.top + mapH + margin.bottom + captionH;
  const X = (x: number) => margin.left + (x - w) * scale;
  const Y = (y: number) => margin.top + (n - y) * scale;
  const path = (rings: Position[][][]) =>
    rings
      .map((poly) => poly.map((ring) => 'M' + ring.map(([x, y]) => `${X(x).toFixed(1)},${Y(y).toFixed(1)}`).join('L') + 'Z').join(''))
      .join('');
  const levels = input.bands.map((b) => b.level_kg);
  const lo = levels[0] ?? 0;
  const hi = levels[levels.length - 1] ?? 1;
  const colourOf = (level: number) => input.colormap(hi > lo ? (level - lo) / (hi - lo) : 0);
  const out: string[] = [];
  out.push(`<svg xmlns="http://www.w3.org/2000/svg" width="${W}" height="${H.toFixed(0)}" viewBox="0 0 ${W} ${H.toFixed(0)}" font-family="sans-serif" font-size="12">`);
  out.push(`<title>${esc(input.title)}</title>`);
  out.push(`<rect width="100%" height="100%" fill="#ffffff"/>`);
  out.push(`<text x="${margin.left}" y="24" font-size="15" font-weight="bold">${esc(input.title)}</text>`);
  out.push(`<rect x="${margin.left}" y="${margin.top}" width="${mapW.toFixed(1)}" height="${mapH.toFixed(1)}" fill="#eeeeee" stroke="#555555"/>`);
  // Bands: the largest region first, so each smaller (cheaper) one is painted over it.
  for (let k = input.bands.length - 1; k >= 0; k--) {
    const b = input.bands[k];
    out.push(`<path d="${path(b.geometry.coordinates)}" fill="${hex(colourOf(b.level_kg))}" fill-rule="evenodd" stroke="none"/>`);
  }
  for (const b of input.bands) {
    out.push(`<path d="${path(b.geometry.coordinates)}" fill="none" stroke="#222222" stroke-width="0.6" stroke-opacity="0.6"/>`);
  }
  out.push(`<path d="${path(input.reachable.geometry.coordinates)}" fill="none" stroke="#d62728" stroke-width="2.5" stroke-dasharray="8 4"/>`);
  if (input.ellipse) {
    const el = input.ellipse;
    out.push(
      `<ellipse cx="${X(el.centreEast_m).toFixed(1)}" cy="${Y(el.centreNorth_m).toFixed(1)}" rx="${(el.semiMajor_m * scale).toFixed(1)}" ry="${(el.semiMinor_m * scale).toFixed(1)}" transform="rotate(${(-el.orientation_deg).toFixed(2)} ${X(el.centreEast_m).toFixed(1)} ${Y(el.centreNorth_m).toFixed(1)})" fill="none" stroke="#ffffff" stroke-width="2"/>`,
    );
  }
  if (input.divertRadius_m && input.divertRadius_m > 0) {
    out.push(`<circle cx="${X(0).toFixed(1)}" cy="${Y(0).toFixed(1)}" r="${(input.divertRadius_m * scale).toFixed(1)}" fill="none" stroke="#000000" stroke-width="1.5" stroke-dasharray="2 3"/>`);
  }
  // Nominal target.
  out.push(`<g stroke="#000000" stroke-width="2"><line x1="${X(0) - 7}" y1="${Y(0)}" x2="${X(0) + 7}" y2="${Y(0)}"/><line x1="${X(0)}" y1="${Y(0) - 7}" x2="${X(0)}" y2="${Y(0) + 7}"/></g>`);
  // Axes with metre ticks.
  const step = niceStep(e - w, 6);
  for (let t = Math.ceil(w / step) * step; t <= e + 1e-9; t += step) {
    out.push(`<line x1="${X(t).toFixed(1)}" y1="${margin.top + mapH}" x2="${X(t).toFixed(1)}" y2="${margin.top + mapH + 5}" stroke="#333"/>`);
    out.push(`<text x="${X(t).toFixed(1)}" y="${margin.top + mapH + 18}" text-anchor="middle">${Math.round(t)}</text>`);
  }
  for (let t = Math.ceil(s / step) * step; t <= n + 1e-9; t += step) {
    out.push(`<line x1="${margin.left - 5}" y1="${Y(t).toFixed(1)}" x2="${margin.left}" y2="${Y(t).toFixed(1)}" stroke="#333"/>`);
    out.push(`<text x="${margin.left - 8}" y="${(Y(t) + 4).toFixed(1)}" text-anchor="end">${Math.round(t)}</text>`);
  }
  out.push(`<text x="${margin.left + mapW / 2}" y="${margin.top + mapH + 36}" text-anchor="middle">east of nominal target (m)</text>`);
  out.push(`<text transform="translate(18 ${margin.top + mapH / 2}) rotate(-90)" text-anchor="middle">north of nominal target (m)</text>`);
  // Scale bar and north arrow inside the map's lower-left / upper-right corners.
  const bar = niceStep(e - w, 4);
  const bx = margin.left + 12;
  const by = margin.top + mapH - 14;
  out.push(`<rect x="${bx - 4}" y="${by - 16}" width="${bar * scale + 8}" height="24" fill="#ffffff" fill-opacity="0.8"/>`);
  out.push(`<line x1="${bx}" y1="${by}" x2="${bx + bar * scale}" y2="${by}" stroke="#000" stroke-width="3"/>`);
  out.push(`<text x="${bx + (bar * scale) / 2}" y="${by - 5}" text-anchor="middle">${bar} m</text>`);
  const ax = margin.left + mapW - 20;
  const ay = margin.top + 14;
  out.push(`<path d="M${ax},${ay} l-7,18 l7,-5 l7,5 z" fill="#000"/><text x="${ax}" y="${ay + 32}" text-anchor="middle" font-weight="bold">N</text>`);
  // Legend: one swatch per band, then the boundary.
  const lx = margin.left + mapW + 20;
  out.push(`<text x="${lx}" y="${margin.top + 4}" font-weight="bold">propellant (kg)</text>`);
  input.bands.forEach((b, k) => {
    const y = margin.top + 14 + k * 20;
    out.push(`<rect x="${lx}" y="${y}" width="18" height="16" fill="${hex(colourOf(b.level_kg))}" stroke="#333"/>`);
    out.push(`<text x="${lx + 24}" y="${y + 12}">≤ ${b.level_kg.toFixed(0)}</text>`);
  });
  const ly = margin.top + 24 + input.bands.length * 20;
  out.push(`<line x1="${lx}" y1="${ly}" x2="${lx + 18}" y2="${ly}" stroke="#d62728" stroke-width="2.5" stroke-dasharray="5 3"/>`);
  out.push(`<text x="${lx + 24}" y="${ly + 4}">budget ${input.budget_kg.toFixed(0)} kg</text>`);
  out.push(`<text x="${lx + 24}" y="${ly + 18}">(reserve kept)</text>`);
  if (input.ellipse) {
    out.push(`<ellipse cx="${lx + 9}" cy="${ly + 38}" rx="9" ry="5" fill="none" stroke="#777" stroke-width="2"/>`);
    out.push(`<text x="${lx + 24}" y="${ly + 42}">${(input.ellipse.probability * 100).toFixed(1)} % ellipse</text>`);
  }
  if (input.divertRadius_m && input.divertRadius_m > 0) {
    const dy = ly + (input.ellipse ? 62 : 40);
    out.push(`<line x1="${lx}" y1="${dy}" x2="${lx + 18}" y2="${dy}" stroke="#000" stroke-width="1.5" stroke-dasharray="2 3"/>`);
    out.push(`<text x="${lx + 24}" y="${dy + 4}">divert ${input.divertRadius_m.toFixed(0)} m</text>`);
  }
  // Caption: provenance and the caution (wrapped to the figure's width).
  const cy = margin.top + mapH + margin.bottom;
  const maxChars = Math.floor((W - margin.left - 10) / 6);
  const lines = [...input.caption.map((t) => ({ t, caution: false })), ...wrap(`Caution: ${CAUTION}`, maxChars).map((t) => ({ t, caution: true }))];
  lines.forEach(({ t, caution }, k) => {
    out.push(`<text x="${margin.left}" y="${(cy + 14 + 16 * k).toFixed(0)}" font-size="11" fill="${caution ? '#a00000' : '#333'}">${esc(t)}</text>`);
  });
  out.push('</svg>');
  return out.join('\n') + '\n';
}

/**
 * The report map of a field and its figures (footprintSvg above): propellant bands in viridis, the
 * reachable region at the budget, the guaranteed divert circle, and an optional landing ellipse.
 */
export function footprintMapSvg(field: FootprintField, figures: FootprintFigures, text: { title: string; caption: string[] }, ellipse?: Ellipse | null): string {
  return footprintSvg({
    title: text.title,
    bounds_m: regionBounds(field),
    bands: figures.bands,
    reachable: figures.reachable,
    budget_kg: figures.summary.budget_kg,
    colormap: (t) => sampleColormap(VIRIDIS, t) as unknown as [number, number, number],
    divertRadius_m: figures.divert.radius_m,
    caption: text.caption,
    ellipse,
  });
}
