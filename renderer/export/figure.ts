/**
 * Compose an exported figure in the browser: the rendered scene with its legend, scale bar, north
 * arrow and contour labels drawn in, a caption band under it, encoded as PNG with the caption also
 * written as PNG text metadata.
 */
import { addPngText } from './png-metadata.ts';
import { captionLines, captionMetadata, type CaptionFacts } from './caption.ts';
import { sampleColormap, VIRIDIS, type Colormap } from '../../core/study/colormap.ts';
import type { SceneSnapshot } from '../scene/terrain-scene.ts';
import type { LegendEntry } from '../scene/scene-colours.ts';

export const FIGURE_SIZES = {
  view: null,
  'full-hd': { width: 1920, height: 1080 },
  '4k': { width: 3840, height: 2160 },
} as const;
export type FigureSize = keyof typeof FIGURE_SIZES;

export interface FigureLegend {
  /** Quantity and unit, e.g. "Terrain height (m)". */
  title: string;
  min: number;
  max: number;
  colormap?: Colormap;
  /** What else is drawn (scene-colours.ts legendEntries): one line each under the colour bar. */
  entries?: readonly LegendEntry[];
}

const INK = '#dbe3ea';
const PANEL = 'rgba(16, 20, 24, 0.85)';

function drawLegend(ctx: CanvasRenderingContext2D, legend: FigureLegend, x: number, y: number, s: number): void {
  ctx.font = `${Math.round(13 * s)}px system-ui, sans-serif`;
  const entries = legend.entries ?? [];
  ctx.font = `${Math.round(12 * s)}px system-ui, sans-serif`;
  const entriesWidth = Math.max(0, ...entries.map((e) => ctx.measureText(e.text).width + 36 * s));
  ctx.font = `${Math.round(13 * s)}px system-ui, sans-serif`;
  const width = Math.max(300 * s, ctx.measureText(legend.title).width + 20 * s, entriesWidth);
  const line = 16 * s;
  const height = 64 * s + entries.length * line;
  ctx.fillStyle = PANEL;
  ctx.fillRect(x, y - height, width, height);
  ctx.fillStyle = INK;
  ctx.textBaseline = 'top';
  ctx.textAlign = 'left';
  ctx.fillText(legend.title, x + 10 * s, y - height + 8 * s);
  const barX = x + 10 * s;
  const barY = y - height + 28 * s;
  const barW = width - 20 * s;
  const rgb = [0, 0, 0];
  for (let i = 0; i < barW; i++) {
    sampleColormap(legend.colormap ?? VIRIDIS, i / (barW - 1), rgb);
    ctx.fillStyle = `rgb(${rgb.map((c) => Math.round(c * 255)).join(' ')})`;
    ctx.fillRect(barX + i, barY, 1.5, 12 * s);
  }
  ctx.fillStyle = INK;
  ctx.font = `${Math.round(12 * s)}px system-ui, sans-serif`;
  const ticks = [legend.min, (legend.min + legend.max) / 2, legend.max];
  ticks.forEach((v, k) => {
    ctx.textAlign = k === 0 ? 'left' : k === 1 ? 'center' : 'right';
    ctx.fillText(String(Math.round(v)), barX + (k * barW) / 2, barY + 16 * s);
  });
  // One key and its text per entry: the key's shape as in the scene (ring, line, fill…), simplified.
  ctx.textAlign = 'left';
  entries.forEach((entry, k) => {
    const y0 = barY + 34 * s + k * line;
    const cx = barX + 8 * s;
    const cy = y0 + 6 * s;
    ctx.strokeStyle = entry.colour;
    ctx.fillStyle = entry.colour;
    ctx.lineWidth = 2 * s;
    if (entry.shape === 'ring') {
      ctx.beginPath();
      ctx.arc(cx, cy, 5 * s, 0, 2 * Math.PI);
      ctx.stroke();
    } else if (entry.shape === 'ball') {
      ctx.beginPath();
      ctx.arc(cx, cy, 4 * s, 0, 2 * Math.PI);
      ctx.fill();
    } else if (entry.shape === 'line' || entry.shape === 'bold-line') {
      ctx.fillRect(cx - 7 * s, cy - (entry.shape === 'line' ? 1 : 1.5) * s, 14 * s, (entry.shape === 'line' ? 2 : 3) * s);
    } else if (entry.shape === 'fill') {
      ctx.globalAlpha = 0.6;
      ctx.fillRect(cx - 7 * s, cy - 5 * s, 14 * s, 10 * s);
      ctx.globalAlpha = 1;
    } else if (entry.shape === 'pin') {
      ctx.fillRect(cx - 1.5 * s, cy - 6 * s, 3 * s, 12 * s);
      ctx.strokeStyle = '#888';
      ctx.lineWidth = 1 * s;
      ctx.strokeRect(cx - 1.5 * s, cy - 6 * s, 3 * s, 12 * s);
    } else {
      ctx.lineWidth = 1.5 * s;
      for (let d = -10; d <= 10; d += 5) {
        ctx.beginPath();
        ctx.moveTo(Math.max(cx - 7 * s, cx + (d - 5) * s), cy + 5 * s);
        ctx.lineTo(Math.min(cx + 7 * s, cx + (d + 5) * s), cy - 5 * s);
        ctx.stroke();
      }
    }
    ctx.fillStyle = INK;
    ctx.textBaseline = 'top';
    ctx.fillText(entry.text, barX + 22 * s, y0);
  });
}

function drawScaleBar(ctx: CanvasRenderingContext2D, snap: SceneSnapshot, right: number, bottom: number, s: number): void {
  const { pixels, label } = snap.info.scaleBar;
  ctx.strokeStyle = INK;
  ctx.lineWidth = 2 * s;
  ctx.beginPath();
  ctx.moveTo(right - pixels, bottom - 24 * s);
  ctx.lineTo(right - pixels, bottom - 18 * s);
  ctx.lineTo(right, bottom - 18 * s);
  ctx.lineTo(right, bottom - 24 * s);
  ctx.stroke();
  ctx.fillStyle = INK;
  ctx.font = `${Math.round(13 * s)}px system-ui, sans-serif`;
  ctx.textAlign = 'right';
  ctx.textBaseline = 'top';
  ctx.fillText(label, right, bottom - 14 * s);
}

function drawNorthArrow(ctx: CanvasRenderingContext2D, angle: number, cx: number, cy: number, s: number): void {
  ctx.save();
  ctx.translate(cx, cy);
  ctx.rotate(angle);
  ctx.fillStyle = INK;
  ctx.beginPath();
  ctx.moveTo(0, -18 * s);
  ctx.lineTo(7 * s, 8 * s);
  ctx.lineTo(0, 3 * s);
  ctx.lineTo(-7 * s, 8 * s);
  ctx.closePath();
  ctx.fill();
  ctx.restore();
  ctx.font = `bold ${Math.round(13 * s)}px system-ui, sans-serif`;
  ctx.textAlign = 'center';
  ctx.textBaseline = 'top';
  ctx.fillText('N', cx, cy + 14 * s);
}

/**
 * Compose a figure from `image` with the caption band. With `scene`, the scene's legend, scale bar,
 * north arrow and contour labels are drawn in too.
 */
export async function composeFigurePng(image: HTMLCanvasElement, facts: CaptionFacts, scene?: { snapshot: SceneSnapshot; legend: FigureLegend }): Promise<Uint8Array> {
  // Furniture scales with the figure width, so a 2× chart or a 4K scene keeps readable text.
  const s = Math.max(1, image.width / 1000);
  const band = Math.round(46 * s);
  const canvas = document.createElement('canvas');
  canvas.width = image.width;
  canvas.height = image.height + band;
  const ctx = canvas.getContext('2d');
  if (!ctx) throw new Error('figure export: the browser gave no 2D canvas');
  ctx.drawImage(image, 0, 0);

  if (scene) {
    const snap = scene.snapshot;
    ctx.font = `${Math.round(11 * s)}px ui-monospace, monospace`;
    ctx.textAlign = 'center';
    ctx.textBaseline = 'middle';
    ctx.shadowColor = '#000';
    ctx.shadowBlur = 3 * s;
    ctx.fillStyle = '#f4f1ea';
    for (const label of snap.info.contourLabels) ctx.fillText(`${label.value} ${label.unit}`, label.x, label.y);
    for (const label of snap.info.siteLabels) ctx.fillText(label.text, label.x, label.y);
    ctx.fillStyle = '#8c9aa7';
    for (const label of snap.info.axisLabels) ctx.fillText(label.text, label.x, label.y);
    ctx.shadowBlur = 0;
    drawLegend(ctx, scene.legend, 12 * s, image.height - 12 * s, s);
    drawScaleBar(ctx, snap, image.width - 16 * s, image.height - 8 * s, s);
    drawNorthArrow(ctx, snap.info.northAngle_rad, image.width - 34 * s, 36 * s, s);
  }

  ctx.fillStyle = '#101418';
  ctx.fillRect(0, image.height, canvas.width, band);
  const [factsLine, caution] = captionLines(facts);
  ctx.textAlign = 'left';
  ctx.textBaseline = 'middle';
  ctx.font = `${Math.round(14 * s)}px system-ui, sans-serif`;
  ctx.fillStyle = INK;
  ctx.fillText(factsLine, 12 * s, image.height + band * 0.3);
  ctx.fillStyle = '#f2d16b';
  ctx.fillText(caution, 12 * s, image.height + band * 0.72);
  const blob = await new Promise<Blob | null>((resolve) => canvas.toBlob(resolve, 'image/png'));
  if (!blob) throw new Error('figure export: the browser could not encode the PNG');
  return addPngText(new Uint8Array(await blob.arrayBuffer()), captionMetadata(facts));
}
