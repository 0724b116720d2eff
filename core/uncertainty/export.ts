/**
 * Exports of the landing-success study, shared by the CLI and (later) the app: the per-sample CSV, the
 * comparison table (without divert: Monte Carlo and Gaussian ellipse model; with divert: closed loop), the
 * versioned JSON report with its provenance (inputs, seed, interval method), and an SVG figure for reports.
 * Pure: data in, text out.
 */
import { APP_VERSION, CAUTION } from '../study/provenance.ts';
import type { LandingSample } from './closedLoop.ts';
import type { HazardLayer } from './hazardLayer.ts';
import { cellCentreGround } from './hazardLayer.ts';
import type { LandingSuccessSummary } from './landingSuccess.ts';

const num = (v: number, d: number) => (Number.isFinite(v) ? Number(v.toFixed(d)).toString() : '');

export const LANDING_SAMPLES_CSV_HEADER =
  'sample,open_loop_east_m,open_loop_north_m,open_loop_safe,open_loop_propellant_kg,outcome,success,landing_east_m,landing_north_m,target,planned_east_m,planned_north_m,miss_m,propellant_kg,replans,replan_failures,touchdown_velocity_error_mps,solves';

const targetName = (k: number) => (k < 0 ? 'none' : k === 0 ? 'nominal' : `site-${k}`);

/** Caution, header, one row per sample (index order). */
export function landingSamplesCsvLines(samples: readonly LandingSample[]): string[] {
  return [
    `# ${CAUTION}`,
    LANDING_SAMPLES_CSV_HEADER,
    ...samples.map((s) =>
      [
        s.index, num(s.openLoopEast_m, 2), num(s.openLoopNorth_m, 2), s.openLoopSafe ? 1 : 0, num(s.openLoopPropellant_kg, 3),
        s.outcome, s.success ? 1 : 0, num(s.landingEast_m, 2), num(s.landingNorth_m, 2), targetName(s.targetChoice),
        num(s.plannedEast_m, 2), num(s.plannedNorth_m, 2), num(s.miss_m, 2), num(s.propellant_kg, 3), s.replans, s.replanFailures,
        num(s.touchdownVelocityError_mps, 3), s.solves,
      ].join(','),
    ),
  ];
}

export interface ComparisonRow {
  method: string;
  pSafe: number;
  lower: number;
  upper: number;
  propellantP50_kg: number;
  propellantP90_kg: number;
  propellantP99_kg: number;
}

/** The ellipse-only vs divert table: one row per way of landing. */
export function comparisonRows(s: LandingSuccessSummary): ComparisonRow[] {
  const w = s.withoutDivert;
  const d = s.withDivert;
  return [
    { method: 'without divert, Monte Carlo (open loop)', pSafe: w.safeTouchdown.estimate, lower: w.safeTouchdown.lower, upper: w.safeTouchdown.upper, propellantP50_kg: w.propellant.p50_kg, propellantP90_kg: w.propellant.p90_kg, propellantP99_kg: w.propellant.p99_kg },
    { method: 'without divert, Gaussian ellipse model', pSafe: w.gaussianSafeProbability, lower: NaN, upper: NaN, propellantP50_kg: NaN, propellantP90_kg: NaN, propellantP99_kg: NaN },
    { method: 'with divert, closed loop', pSafe: d.safeTouchdown.estimate, lower: d.safeTouchdown.lower, upper: d.safeTouchdown.upper, propellantP50_kg: d.propellant.p50_kg, propellantP90_kg: d.propellant.p90_kg, propellantP99_kg: d.propellant.p99_kg },
  ];
}

export const COMPARISON_CSV_HEADER = 'method,p_safe_touchdown,ci_lower,ci_upper,propellant_p50_kg,propellant_p90_kg,propellant_p99_kg';

export function comparisonCsvLines(s: LandingSuccessSummary): string[] {
  return [
    `# ${CAUTION}`,
    `# ${(s.confidence * 100).toFixed(0)} % ${s.intervalMethod}; ${s.samples} samples`,
    COMPARISON_CSV_HEADER,
    ...comparisonRows(s).map((r) => [`"${r.method}"`, num(r.pSafe, 5), num(r.lower, 5), num(r.upper, 5), num(r.propellantP50_kg, 3), num(r.propellantP90_kg, 3), num(r.propellantP99_kg, 3)].join(',')),
  ];
}

/** Plain-text table for the terminal. */
export function comparisonText(s: LandingSuccessSummary): string {
  const pct = (v: number) => (Number.isFinite(v) ? `${(100 * v).toFixed(1)} %` : '—');
  const kg = (v: number) => (Number.isFinite(v) ? v.toFixed(1) : '—');
  const rows = comparisonRows(s);
  const lines = [
    `P(safe touchdown), ${(s.confidence * 100).toFixed(0)} % ${s.intervalMethod}, ${s.samples} samples:`,
    `  ${'method'.padEnd(42)} ${'P(safe)'.padStart(8)}  ${'interval'.padEnd(17)} ${'P50 kg'.padStart(8)} ${'P90 kg'.padStart(8)} ${'P99 kg'.padStart(8)}`,
    ...rows.map((r) => `  ${r.method.padEnd(42)} ${pct(r.pSafe).padStart(8)}  ${(Number.isFinite(r.lower) ? `${pct(r.lower)} – ${pct(r.upper)}` : '(model)').padEnd(17)} ${kg(r.propellantP50_kg).padStart(8)} ${kg(r.propellantP90_kg).padStart(8)} ${kg(r.propellantP99_kg).padStart(8)}`),
    `  no safe reachable site: ${pct(s.withDivert.noSafeReachableSite.estimate)} (${pct(s.withDivert.noSafeReachableSite.lower)} – ${pct(s.withDivert.noSafeReachableSite.upper)})`,
  ];
  return lines.join('\n');
}

/**
 * Versioned report ("landreach-landing-success" version 1) with its provenance. No date or run time in it:
 * the same inputs give the same bytes for any worker count (those go to the output set's manifest).
 */
export function landingSuccessReport(r: {
  inputs: unknown;
  inputsHash: string;
  seed: number;
  cancelled: boolean;
  summary: LandingSuccessSummary;
  sites: readonly (readonly [number, number])[];
  hazard: Record<string, unknown>;
  policy: string;
  model: string;
  /** Trade-curve rows, if any were asked for. */
  trade?: unknown[];
}): string {
  return JSON.stringify(
    {
      format: 'landreach-landing-success',
      version: 1,
      caution: CAUTION,
      appVersion: APP_VERSION,
      inputsHash: r.inputsHash,
      seed: r.seed,
      randomStreams: 'each sample draws from its own stream keyed by (seed, sample index): mulberry32 seeded through MurmurHash3 fmix32; Box–Muller normals',
      intervalMethod: r.summary.intervalMethod,
      confidence: r.summary.confidence,
      illustrativeDefaults: 'default dispersions, navigation errors and tolerances are illustrative, not from any mission',
      cancelled: r.cancelled,
      policy: r.policy,
      model: r.model,
      inputs: r.inputs,
      hazard: r.hazard,
      sites: r.sites.map(([e, n], k) => ({ rank: k + 1, east_m: e, north_m: n })),
      summary: r.summary,
      comparison: comparisonRows(r.summary),
      trade: r.trade ?? [],
    },
    (_k, v) => (typeof v === 'number' && !Number.isFinite(v) ? null : v),
    1,
  ) + '\n';
}

const esc = (t: string) => t.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;');

/**
 * The figure: the hazard map (unsafe ground shaded, DEM outline), the landing points without divert and
 * their ellipse, the touchdowns with divert (failures marked), the nominal target and the ranked sites; the
 * comparison table beside it; a caption with provenance and the caution.
 */
export function landingSuccessSvg(
  layer: HazardLayer,
  samples: readonly LandingSample[],
  summary: LandingSuccessSummary,
  sites: readonly (readonly [number, number])[],
  caption: string[],
): string {
  const W = 980;
  const mapSize = 560;
  const m = { left: 70, top: 40 };
  // Ground extent of the DEM (its corners through the inverse ground map).
  const corners = [0, layer.width - 1, (layer.height - 1) * layer.width, layer.height * layer.width - 1].map((k) => cellCentreGround(layer, k));
  const xs = corners.map((c) => c[0]);
  const ys = corners.map((c) => c[1]);
  const w0 = Math.min(...xs), e0 = Math.max(...xs), s0 = Math.min(...ys), n0 = Math.max(...ys);
  const span = Math.max(e0 - w0, n0 - s0);
  const scale = mapSize / span;
  const X = (e: number) => m.left + (e - w0) * scale;
  const Y = (n: number) => m.top + (n0 - n) * scale;
  const out: string[] = [];
  const captionLines = [...caption, `Caution: ${CAUTION}`];
  // (the caution is one line at this width; the caption lines are short)
  const H = m.top + mapSize + 50 + 16 * captionLines.length + 10;
  out.push(`<svg xmlns="http://www.w3.org/2000/svg" width="${W}" height="${H}" viewBox="0 0 ${W} ${H}" font-family="sans-serif" font-size="12">`);
  out.push(`<rect width="${W}" height="${H}" fill="#ffffff"/>`);
  out.push(`<text x="${m.left}" y="22" font-size="15" font-weight="bold">Landing success without and with divert</text>`);
  // Hazard map: unsafe cells, merged into runs along rows of a coarsened grid (at most 200 blocks a side).
  const block = Math.max(1, Math.ceil(Math.max(layer.width, layer.height) / 200));
  const bw = block * layer.pixelSizeX_m * scale;
  const bh = block * layer.pixelSizeY_m * scale;
  out.push(`<rect x="${X(w0 - (layer.pixelSizeX_m / 2)).toFixed(1)}" y="${Y(n0 + layer.pixelSizeY_m / 2).toFixed(1)}" width="${((e0 - w0 + layer.pixelSizeX_m) * scale).toFixed(1)}" height="${((n0 - s0 + layer.pixelSizeY_m) * scale).toFixed(1)}" fill="#f4f1e8" stroke="#333"/>`);
  out.push('<g fill="#8c8c8c" shape-rendering="crispEdges">');
  for (let br = 0; br * block < layer.height; br++) {
    let runStart = -1;
    const bcols = Math.ceil(layer.width / block);
    for (let bc = 0; bc <= bcols; bc++) {
      let unsafe = false;
      if (bc < bcols) {
        for (let r = br * block; r < Math.min(layer.height, (br + 1) * block) && !unsafe; r++) {
          for (let c = bc * block; c < Math.min(layer.width, (bc + 1) * block); c++) if (!layer.safe[r * layer.width + c]) { unsafe = true; break; }
        }
      }
      if (unsafe && runStart < 0) runStart = bc;
      if (!unsafe && runStart >= 0) {
        const [e, n] = cellCentreGround(layer, br * block * layer.width + runStart * block);
        out.push(`<rect x="${(X(e) - (layer.pixelSizeX_m * scale) / 2).toFixed(1)}" y="${(Y(n) - (layer.pixelSizeY_m * scale) / 2).toFixed(1)}" width="${((bc - runStart) * bw).toFixed(1)}" height="${bh.toFixed(1)}"/>`);
        runStart = -1;
      }
    }
  }
  out.push('</g>');
  const inMap = (e: number, n: number) => e >= w0 - span && e <= e0 + span && n >= s0 - span && n <= n0 + span;
  out.push('<g fill="#e69f00" fill-opacity="0.7">');
  for (const s of samples) if (inMap(s.openLoopEast_m, s.openLoopNorth_m)) out.push(`<circle cx="${X(s.openLoopEast_m).toFixed(1)}" cy="${Y(s.openLoopNorth_m).toFixed(1)}" r="2"/>`);
  out.push('</g>');
  const el = summary.withoutDivert.ellipse;
  if (Number.isFinite(el.semiMajor_m)) {
    out.push(`<ellipse cx="${X(el.centreEast_m).toFixed(1)}" cy="${Y(el.centreNorth_m).toFixed(1)}" rx="${(el.semiMajor_m * scale).toFixed(1)}" ry="${(el.semiMinor_m * scale).toFixed(1)}" transform="rotate(${(-el.orientation_deg).toFixed(2)} ${X(el.centreEast_m).toFixed(1)} ${Y(el.centreNorth_m).toFixed(1)})" fill="none" stroke="#d55e00" stroke-width="2" stroke-dasharray="6 3"/>`);
  }
  out.push('<g fill="#0072b2">');
  for (const s of samples) if (s.success) out.push(`<circle cx="${X(s.landingEast_m).toFixed(1)}" cy="${Y(s.landingNorth_m).toFixed(1)}" r="2"/>`);
  out.push('</g><g stroke="#cc0000" stroke-width="1.5">');
  for (const s of samples) {
    if (s.success || !inMap(s.landingEast_m, s.landingNorth_m)) continue;
    const x = X(s.landingEast_m), y = Y(s.landingNorth_m);
    out.push(`<path d="M${(x - 3).toFixed(1)},${(y - 3).toFixed(1)} l6,6 m0,-6 l-6,6"/>`);
  }
  out.push('</g>');
  for (const [k, [e, n]] of sites.entries()) {
    out.push(`<path d="M${X(e).toFixed(1)},${(Y(n) - 6).toFixed(1)} l5,9 l-10,0 z" fill="#009e73" stroke="#000" stroke-width="0.5"/><text x="${(X(e) + 6).toFixed(1)}" y="${(Y(n) + 4).toFixed(1)}" font-size="10">${k + 1}</text>`);
  }
  out.push(`<g stroke="#000" stroke-width="2"><line x1="${X(0) - 7}" y1="${Y(0)}" x2="${X(0) + 7}" y2="${Y(0)}"/><line x1="${X(0)}" y1="${Y(0) - 7}" x2="${X(0)}" y2="${Y(0) + 7}"/></g>`);
  // Scale bar.
  const bar = [10, 20, 50, 100, 200, 500, 1000, 2000, 5000].find((b) => b * scale >= mapSize / 6) ?? 10000;
  out.push(`<line x1="${m.left + 10}" y1="${m.top + mapSize - 12}" x2="${m.left + 10 + bar * scale}" y2="${m.top + mapSize - 12}" stroke="#000" stroke-width="3"/><text x="${m.left + 10 + (bar * scale) / 2}" y="${m.top + mapSize - 18}" text-anchor="middle">${bar} m</text>`);
  out.push(`<text x="${m.left + mapSize / 2}" y="${m.top + mapSize + 20}" text-anchor="middle">east of nominal target (m) — DEM ${layer.width} × ${layer.height} cells, unsafe or unknown ground grey</text>`);
  // Legend and table.
  const lx = m.left + mapSize + 24;
  let ly = m.top + 10;
  const legend: [string, string][] = [
    ['<circle r="3" fill="#e69f00"/>', 'touchdown without divert (open loop)'],
    ['<line x1="-8" x2="8" stroke="#d55e00" stroke-width="2" stroke-dasharray="6 3"/>', `${(el.probability * 100).toFixed(1)} % ellipse of those points`],
    ['<circle r="3" fill="#0072b2"/>', 'safe touchdown with divert'],
    ['<path d="M-3,-3 l6,6 m0,-6 l-6,6" stroke="#cc0000" stroke-width="1.5"/>', 'failed touchdown with divert'],
    ['<path d="M0,-6 l5,9 l-10,0 z" fill="#009e73"/>', 'ranked safe sites'],
    ['<path d="M-7,0 h14 M0,-7 v14" stroke="#000" stroke-width="2"/>', 'nominal target'],
  ];
  for (const [icon, text] of legend) {
    out.push(`<g transform="translate(${lx + 8} ${ly})">${icon}</g><text x="${lx + 22}" y="${ly + 4}">${esc(text)}</text>`);
    ly += 20;
  }
  ly += 10;
  const pct = (v: number) => (Number.isFinite(v) ? `${(100 * v).toFixed(1)} %` : '—');
  out.push(`<text x="${lx}" y="${ly}" font-weight="bold">P(safe touchdown), ${(summary.confidence * 100).toFixed(0)} % Wilson interval</text>`);
  ly += 18;
  for (const r of comparisonRows(summary)) {
    out.push(`<text x="${lx}" y="${ly}">${esc(r.method)}</text>`);
    ly += 15;
    const ci = Number.isFinite(r.lower) ? ` (${pct(r.lower)} – ${pct(r.upper)})` : ' (model, no interval)';
    out.push(`<text x="${lx + 10}" y="${ly}" font-size="11">${esc(pct(r.pSafe) + ci)}</text>`);
    if (Number.isFinite(r.propellantP99_kg)) {
      ly += 14;
      out.push(`<text x="${lx + 10}" y="${ly}" font-size="11">${esc(`propellant P50 / P90 / P99: ${r.propellantP50_kg.toFixed(1)} / ${r.propellantP90_kg.toFixed(1)} / ${r.propellantP99_kg.toFixed(1)} kg`)}</text>`);
    }
    ly += 20;
  }
  out.push(`<text x="${lx}" y="${ly}" font-size="11">no safe reachable site: ${esc(pct(summary.withDivert.noSafeReachableSite.estimate))}; ${summary.samples} samples</text>`);
  const cy = m.top + mapSize + 44;
  captionLines.forEach((t, k) => out.push(`<text x="${m.left}" y="${cy + 16 * k}" font-size="11" fill="${k === captionLines.length - 1 ? '#a00000' : '#333'}">${esc(t)}</text>`));
  out.push('</svg>');
  return out.join('\n') + '\n';
}
