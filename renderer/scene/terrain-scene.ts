/**
 * The live three.js scene: renderer, camera, controls, lights and the objects made by the pure
 * builders. Renders on demand (only after a change), so an idle workspace costs no CPU. Owned by
 * SceneView.svelte, which creates it on mount and disposes it on destroy.
 */
import {
  AmbientLight,
  BufferAttribute,
  BufferGeometry,
  Color,
  DirectionalLight,
  LineBasicMaterial,
  LineSegments,
  Mesh,
  MeshBasicMaterial,
  MeshLambertMaterial,
  PerspectiveCamera,
  Scene,
  SRGBColorSpace,
  Vector2,
  Vector3,
  WebGLRenderer,
  type Material,
  type Object3D,
} from 'three';
import { OrbitControls } from 'three/addons/controls/OrbitControls.js';
import { buildContourGeometry, computeContours, niceThresholds, type ContourLabel } from './contour-lines.ts';
import { heightRange, sampleHeight, targetGroundHeight, type ElevationGrid } from './elevation-grid.ts';
import { SCENE_COLOURS } from './scene-colours.ts';
import { buildAxisObjects, buildMarkerObjects, siteLabelPositions, type AxisLabel, type IgnitionMarker, type LandingEllipse, type PickedTarget, type SceneTrajectory } from './scene-objects.ts';
import { pickGround, toNdc, type GroundPick } from './picking.ts';
import { buildTerrainGeometry, setTerrainExaggeration } from './terrain-mesh.ts';
import { colorizeLinear } from '../../core/study/colormap.ts';
import { buildOutlineGeometry, type FootprintOutline } from './footprint-outlines.ts';
import { buildHazardGeometry, hazardStripeTexture } from './hazard-overlay.ts';
import { boundsContain, declutter, distanceToGround, divertBounds, fitPose, metresPerPixel, northAngle, poseAlong, presetPose, scaleBar, type SceneBounds, type ViewPreset } from './view.ts';
import { buildFootprintPlaneGeometry } from './footprint-plane.ts';
import type { ScalarGrid } from './resample.ts';

export const SCENE_BACKGROUND = '#0b0f13';
const FOV_DEG = 40;
/** Contour labels closer than this on screen are dropped (the first one placed wins). */
const LABEL_SPACING_PX = 48;

export interface ViewInfo {
  scaleBar: { pixels: number; label: string };
  northAngle_rad: number;
  contourLabels: { value: number; unit: string; x: number; y: number }[];
  axisLabels: { text: string; x: number; y: number }[];
  /** Numbers of the ranked landing sites, at the top of their pins. */
  siteLabels: { text: string; x: number; y: number }[];
}

/** A rendered frame and the view furniture that belongs on it, in the frame's pixels. */
export interface SceneSnapshot {
  image: HTMLCanvasElement;
  info: ViewInfo;
}

export type { IgnitionMarker, LandingEllipse, PickedTarget, SceneTrajectory } from './scene-objects.ts';
export type { GroundPick } from './picking.ts';
export type { FootprintOutline } from './footprint-outlines.ts';

/** A field draped on the terrain instead of its height: one value per terrain sample (NaN = none). */
export interface SceneDrape {
  values: Float32Array;
  range: [number, number];
  /**
   * The field on its own grid (e.g. propellant on the footprint's targets), when it may reach past the terrain:
   * its cells with no terrain under them are drawn on the plane of the target's ground (footprint-plane.ts).
   */
  source?: ScalarGrid;
}

export class TerrainScene {
  private readonly renderer: WebGLRenderer;
  private readonly scene = new Scene();
  private readonly camera = new PerspectiveCamera(FOV_DEG, 1, 1, 1e6);
  private readonly controls: OrbitControls;
  private grid: ElevationGrid | null = null;
  private terrain: Mesh | null = null;
  private contours: LineSegments | null = null;
  private labels: ContourLabel[] = [];
  private axes: LineSegments | null = null;
  private axisLabels: AxisLabel[] = [];
  private markers: Object3D[] = [];
  private ignition: IgnitionMarker | null = null;
  private trajectories: SceneTrajectory[] = [];
  private ellipse: LandingEllipse | null = null;
  private picks: PickedTarget[] = [];
  private sites: PickedTarget[] = [];
  private safeReachable: Float32Array | null = null;
  private outlines: FootprintOutline[] = [];
  private outlineObjects: LineSegments[] = [];
  private outlineLabels: ContourLabel[] = [];
  private exaggeration = 1;
  private drape: SceneDrape | null = null;
  private hazardMask: Uint8Array | null = null;
  private hazardVisible = false;
  private hazardMesh: Mesh | null = null;
  private drapePlane: Mesh | null = null;
  /** The box the view was last fitted to: a change that stays inside it keeps the user's view. */
  private framed: SceneBounds | null = null;
  private frame = 0;
  private disposed = false;
  /** Frames drawn so far (the browser tests read it to know the scene has drawn). */
  framesDrawn = 0;

  constructor(
    private readonly canvas: HTMLCanvasElement,
    private readonly onview: (info: ViewInfo) => void,
  ) {
    // preserveDrawingBuffer: figure export and the pixel-readback test read the canvas after drawing.
    this.renderer = new WebGLRenderer({ canvas, antialias: true, preserveDrawingBuffer: true });
    this.renderer.outputColorSpace = SRGBColorSpace;
    this.renderer.setClearColor(new Color(SCENE_BACKGROUND));
    this.camera.up.set(0, 0, 1);
    this.controls = new OrbitControls(this.camera, canvas);
    this.controls.enableDamping = false;
    this.controls.screenSpacePanning = true;
    this.controls.addEventListener('change', () => this.requestRender());
    this.scene.add(new AmbientLight(0xffffff, 0.55));
    // Sun from the north-west, 45° up: the cartographic hillshade convention.
    const sun = new DirectionalLight(0xffffff, 2.2);
    sun.position.set(-1, 1, Math.SQRT2);
    this.scene.add(sun);
  }

  /** Size and placement of the terrain drawn (no heights), or null before any: for tests and drape builders. */
  terrainLayout(): { width: number; height: number; pixelSize_m: number; west_m: number; north_m: number } | null {
    if (!this.grid) return null;
    const { width, height, pixelSize_m, west_m, north_m } = this.grid;
    return { width, height, pixelSize_m, west_m, north_m };
  }

  setTerrain(grid: ElevationGrid, exaggeration: number): void {
    this.grid = grid;
    this.exaggeration = exaggeration;
    this.removeObject(this.terrain);
    this.drape = null;
    this.hazardMask = null;
    this.safeReachable = null;
    this.sites = [];
    const geometry = buildTerrainGeometry(grid, { exaggeration });
    this.terrain = new Mesh(geometry, new MeshLambertMaterial({ vertexColors: true }));
    this.scene.add(this.terrain);
    this.rebuildOverlays();
    this.setView('oblique');
  }

  setExaggeration(exaggeration: number): void {
    if (!this.grid || !this.terrain || exaggeration === this.exaggeration) return;
    this.exaggeration = exaggeration;
    setTerrainExaggeration(this.terrain.geometry, this.grid, exaggeration);
    this.rebuildOverlays();
    // Heights scale about z = 0 (the DEM's datum), so every object moves: fit the view again, from the same
    // direction, or a site hundreds of metres from the datum leaves the view.
    this.refit(true);
    this.requestRender();
  }

  setIgnition(marker: IgnitionMarker | null): void {
    this.ignition = marker;
    this.rebuildMarkers();
    this.refit(false);
    this.requestRender();
  }

  /** Colour the terrain by `drape` (e.g. propellant cost resampled onto the terrain), or by height when null. */
  setDrape(drape: SceneDrape | null): void {
    if (!this.grid || !this.terrain) return;
    if (drape && drape.values.length !== this.grid.heights.length) {
      throw new Error(`invalid drape: ${drape.values.length} values for ${this.grid.heights.length} terrain samples`);
    }
    this.drape = drape;
    const [lo, hi] = drape?.range ?? heightRange(this.grid.heights);
    const colors = colorizeLinear(drape?.values ?? this.grid.heights, lo, hi > lo ? hi : lo + 1);
    this.terrain.geometry.setAttribute('color', new BufferAttribute(colors, 3));
    this.rebuildDrapePlane();
    this.refit(false);
    this.requestRender();
  }

  /** Hazard mask, one value per terrain sample (non-zero = unsafe), or null for none. */
  setHazard(mask: Uint8Array | null, visible: boolean): void {
    this.hazardMask = mask;
    this.hazardVisible = visible;
    this.rebuildHazard();
    this.requestRender();
  }

  /** Show these trajectories (replacing any shown), each as a path with thrust vectors. */
  setTrajectories(trajectories: SceneTrajectory[]): void {
    this.trajectories = trajectories;
    this.rebuildMarkers();
    this.refit(false);
    this.requestRender();
  }

  /** Footprint outlines (propellant contours, reserve boundary emphasised), replacing any shown. */
  setFootprintOutlines(outlines: FootprintOutline[]): void {
    this.outlines = outlines;
    this.rebuildOutlines();
    this.refit(false);
    this.requestRender();
  }

  private rebuildOutlines(): void {
    // Height contours fade under a footprint so its outlines read first.
    if (this.contours) (this.contours.material as LineBasicMaterial).opacity = this.outlines.length ? 0.18 : 0.55;
    for (const o of this.outlineObjects) this.removeObject(o);
    this.outlineObjects = [];
    this.outlineLabels = [];
    if (!this.grid) return;
    for (const outline of this.outlines) {
      const { geometry, label } = buildOutlineGeometry(outline, this.grid, this.exaggeration, outline.emphasis ? 3 : 2);
      // The reserve boundary bright at full opacity, contours dimmer (line width is 1 px in WebGL).
      const material = new LineBasicMaterial({ color: outline.emphasis ? SCENE_COLOURS.reserve.hex : SCENE_COLOURS.contours.hex, transparent: !outline.emphasis, opacity: outline.emphasis ? 1 : 0.6, depthTest: !outline.emphasis });
      const object = new LineSegments(geometry, material);
      object.renderOrder = outline.emphasis ? 3 : 2;
      this.outlineObjects.push(object);
      this.scene.add(object);
      if (label) this.outlineLabels.push(label);
    }
  }

  /** The ground point under a pointer position (client pixels), or null off the terrain. */
  pickAt(clientX: number, clientY: number): GroundPick | null {
    if (!this.terrain) return null;
    this.camera.updateMatrixWorld();
    return pickGround(this.terrain, this.camera, toNdc(clientX, clientY, this.canvas.getBoundingClientRect()));
  }

  setPicks(picks: PickedTarget[]): void {
    this.picks = picks;
    this.rebuildMarkers();
    this.requestRender();
  }

  setLandingEllipse(ellipse: LandingEllipse | null): void {
    this.ellipse = ellipse;
    this.rebuildMarkers();
    this.requestRender();
  }

  /** Ranked landing sites (best first, numbered pins) and the safe ∩ reachable share per terrain sample, or none. */
  setSites(sites: PickedTarget[], safeReachable: Float32Array | null): void {
    if (safeReachable && this.grid && safeReachable.length !== this.grid.heights.length) safeReachable = null;
    this.sites = sites;
    this.safeReachable = safeReachable;
    this.rebuildMarkers();
    this.requestRender();
  }

  /** Names of the marker objects in the scene (ignition, trajectories, picks, landing ellipse), for the browser tests. */
  markerNames(): string[] {
    return this.markers.map((m) => m.name);
  }

  /**
   * A preset view of the whole divert (`top`, `oblique`), or `site`: the oblique view of the terrain alone, a
   * close-up when the DEM is small next to the approach (the next change that leaves that box refits the divert).
   */
  setView(preset: ViewPreset | 'site'): void {
    const bounds = preset === 'site' ? this.bounds(true) : this.bounds();
    if (!bounds) return;
    this.applyPose(fitPose(presetPose(preset === 'site' ? 'oblique' : preset, bounds, FOV_DEG, this.camera.aspect || 1), bounds, FOV_DEG, this.camera.aspect || 1), bounds);
  }

  /**
   * Fit the view to what is drawn again, keeping the viewing direction: always when `always` (the
   * exaggeration moved everything), otherwise only when something drawn now lies outside the box last framed.
   */
  private refit(always: boolean): void {
    const bounds = this.bounds();
    if (!bounds) return;
    if (!always && this.framed && boundsContain(this.framed, bounds)) return;
    const from = { position: this.camera.position.toArray() as [number, number, number], target: this.controls.target.toArray() as [number, number, number] };
    this.applyPose(poseAlong(from, bounds, FOV_DEG, this.camera.aspect || 1), bounds);
  }

  private applyPose(pose: { position: [number, number, number]; target: [number, number, number] }, bounds: SceneBounds): void {
    this.framed = bounds;
    this.camera.position.set(...pose.position);
    this.controls.target.set(...pose.target);
    const distance = this.camera.position.distanceTo(this.controls.target);
    const size = Math.hypot(bounds.maxEast - bounds.minEast, bounds.maxNorth - bounds.minNorth, bounds.maxZ - bounds.minZ);
    this.camera.near = Math.max(1, distance / 1000);
    this.camera.far = (distance + size) * 20;
    this.camera.updateProjectionMatrix();
    this.controls.update();
    this.requestRender();
  }

  resize(width: number, height: number): void {
    if (width < 1 || height < 1) return;
    this.renderer.setPixelRatio(Math.min(2, globalThis.devicePixelRatio || 1));
    this.renderer.setSize(width, height, false);
    const first = this.camera.aspect === 1 && !this.framed;
    this.camera.aspect = width / height;
    this.camera.updateProjectionMatrix();
    // The view fitted before the canvas had its size was fitted to the wrong aspect.
    if (first) this.refit(true);
    this.requestRender();
  }

  /**
   * Render once at `size` (or the current view size) and return a copy of the pixels, then restore
   * the view. Used for figure export at a chosen resolution.
   */
  snapshot(size: { width: number; height: number } | null): SceneSnapshot {
    const previous = this.renderer.getSize(new Vector2());
    const ratio = this.renderer.getPixelRatio();
    const aspect = this.camera.aspect;
    if (size) {
      this.renderer.setPixelRatio(1);
      this.renderer.setSize(size.width, size.height, false);
      this.camera.aspect = size.width / size.height;
      this.camera.updateProjectionMatrix();
    }
    this.renderer.render(this.scene, this.camera);
    const image = document.createElement('canvas');
    image.width = this.canvas.width;
    image.height = this.canvas.height;
    image.getContext('2d')!.drawImage(this.canvas, 0, 0);
    const info = this.viewInfo(image.width, image.height, image.width / 8);
    if (size) {
      this.renderer.setPixelRatio(ratio);
      this.renderer.setSize(previous.x, previous.y, false);
      this.camera.aspect = aspect;
      this.camera.updateProjectionMatrix();
    }
    this.requestRender();
    return { image, info };
  }

  /** Drawing-buffer pixel where the terrain surface at (east, north) appears, or null if off-view. */
  projectGroundPoint(east: number, north: number): { x: number; y: number } | null {
    if (!this.grid) return null;
    const h = sampleHeight(this.grid, east, north);
    return Number.isNaN(h) ? null : this.projectHeight(east, north, h);
  }

  /** Drawing-buffer pixel of a point `up_m` above the nominal target's ground (trajectory frame). */
  projectAboveTarget(east: number, north: number, up_m: number): { x: number; y: number } | null {
    if (!this.grid) return null;
    return this.projectHeight(east, north, targetGroundHeight(this.grid) + up_m);
  }

  private projectHeight(east: number, north: number, height_m: number): { x: number; y: number } | null {
    const v = new Vector3(east, north, height_m * this.exaggeration).project(this.camera);
    if (v.z > 1 || Math.abs(v.x) > 1 || Math.abs(v.y) > 1) return null;
    return { x: ((v.x + 1) / 2) * this.canvas.width, y: ((1 - v.y) / 2) * this.canvas.height };
  }

  requestRender(): void {
    if (this.frame || this.disposed) return;
    this.frame = requestAnimationFrame(() => {
      this.frame = 0;
      this.draw();
    });
  }

  dispose(): void {
    this.disposed = true;
    if (this.frame) cancelAnimationFrame(this.frame);
    this.controls.dispose();
    this.scene.traverse((object) => {
      const { geometry, material } = object as Partial<Mesh>;
      (geometry as BufferGeometry | undefined)?.dispose();
      (Array.isArray(material) ? material : material ? [material] : []).forEach((m: Material) => m.dispose());
    });
    this.renderer.dispose();
  }

  private draw(): void {
    this.renderer.render(this.scene, this.camera);
    this.framesDrawn++;
    this.onview(this.viewInfo(this.canvas.clientWidth || 1, this.canvas.clientHeight || 1, 140));
  }

  /** Scale bar, north arrow and contour label positions for a view `width` × `height` pixels. */
  private viewInfo(width: number, height: number, maxBar_px: number): ViewInfo {
    const forward = this.camera.getWorldDirection(new Vector3());
    const groundZ = this.grid ? targetGroundHeight(this.grid) * this.exaggeration : 0;
    const distance = distanceToGround(this.camera.position.toArray(), forward.toArray(), groundZ) ?? this.camera.position.distanceTo(this.controls.target);
    const bar = scaleBar(metresPerPixel(distance, this.camera.fov, height), maxBar_px);
    const labels = declutter(
      // Footprint labels first: when labels crowd, the propellant levels are the ones kept.
      // Over a footprint the height labels give way: the propellant levels are what the drape shows.
      [...this.outlineLabels, ...(this.outlines.length ? [] : this.labels)].flatMap((label) => {
        const v = this.camera.position.clone().set(...label.position).project(this.camera);
        if (v.z > 1 || Math.abs(v.x) > 1 || Math.abs(v.y) > 1) return [];
        return [{ value: label.value, unit: label.unit ?? 'm', x: ((v.x + 1) / 2) * width, y: ((1 - v.y) / 2) * height }];
      }),
      (LABEL_SPACING_PX * height) / Math.max(1, this.canvas.clientHeight || height),
    );
    const axisLabels = this.axisLabels.flatMap((label) => {
      const v = this.camera.position.clone().set(...label.position).project(this.camera);
      if (v.z > 1 || Math.abs(v.x) > 1 || Math.abs(v.y) > 1) return [];
      return [{ text: label.text, x: ((v.x + 1) / 2) * width, y: ((1 - v.y) / 2) * height }];
    });
    const siteLabels = this.grid
      ? siteLabelPositions(this.grid, this.exaggeration, this.sites).flatMap((label) => {
          const v = this.camera.position.clone().set(...label.position).project(this.camera);
          if (v.z > 1 || Math.abs(v.x) > 1 || Math.abs(v.y) > 1) return [];
          return [{ text: label.text, x: ((v.x + 1) / 2) * width, y: ((1 - v.y) / 2) * height }];
        })
      : [];
    return { scaleBar: bar, northAngle_rad: northAngle(this.camera.matrixWorld.elements), contourLabels: labels, axisLabels, siteLabels };
  }

  /** The whole divert: terrain, ignition point, trajectories, footprint (drape and outlines), heights exaggerated. */
  private bounds(terrainOnly = false): SceneBounds | null {
    if (!this.grid) return null;
    const g = this.grid;
    const [lo, hi] = heightRange(g.heights);
    const base = targetGroundHeight(g);
    const points: [number, number, number][] = [];
    if (terrainOnly) return divertBounds({ terrain: { west_m: g.west_m, east_m: g.west_m + (g.width - 1) * g.pixelSize_m, south_m: g.north_m - (g.height - 1) * g.pixelSize_m, north_m: g.north_m, lo_m: lo, hi_m: hi }, points }, this.exaggeration);
    if (this.ignition) points.push([this.ignition.east_m, this.ignition.north_m, base + this.ignition.altitude_m]);
    for (const t of this.trajectories) {
      const p = t.samples.position_m;
      for (let k = 0; k + 2 < p.length; k += 3) points.push([p[k], p[k + 1], base + p[k + 2]]);
    }
    const source = this.drape?.source;
    if (source) {
      const east = source.west_m + (source.width - 1) * source.pixelSize_m;
      const south = source.north_m - (source.height - 1) * source.pixelSize_m;
      points.push([source.west_m, south, base], [east, source.north_m, base]);
    }
    for (const outline of this.outlines) for (const polygon of outline.coordinates) for (const ring of polygon) for (const q of ring) points.push([q[0], q[1], base]);
    return divertBounds(
      {
        terrain: { west_m: g.west_m, east_m: g.west_m + (g.width - 1) * g.pixelSize_m, south_m: g.north_m - (g.height - 1) * g.pixelSize_m, north_m: g.north_m, lo_m: lo, hi_m: hi },
        points,
      },
      this.exaggeration,
    );
  }

  /** The drape's cells past the terrain, on the plane of the target's ground. */
  private rebuildDrapePlane(): void {
    this.removeObject(this.drapePlane);
    this.drapePlane = null;
    const source = this.drape?.source;
    if (!this.grid || !source || !this.drape) return;
    const geometry = buildFootprintPlaneGeometry(source, this.grid, { exaggeration: this.exaggeration, range: this.drape.range });
    if (!geometry.getIndex()?.count) {
      geometry.dispose();
      return;
    }
    // Unlit, as a map: the plane is a stand-in for missing terrain, not ground to shade.
    this.drapePlane = new Mesh(geometry, new MeshBasicMaterial({ vertexColors: true, transparent: true, opacity: 0.85 }));
    this.drapePlane.name = 'footprint-plane';
    this.scene.add(this.drapePlane);
  }

  private rebuildOverlays(): void {
    if (!this.grid) return;
    this.removeObject(this.contours);
    const [lo, hi] = heightRange(this.grid.heights);
    const polygons = computeContours(this.grid.heights, this.grid.width, this.grid.height, niceThresholds(lo, hi, 8));
    const { geometry, labels } = buildContourGeometry(polygons, this.grid, { exaggeration: this.exaggeration, lift_m: 1.5 });
    this.contours = new LineSegments(geometry, new LineBasicMaterial({ color: 0xf4f1ea, transparent: true, opacity: 0.55 }));
    this.labels = labels;
    this.scene.add(this.contours);
    this.removeObject(this.axes);
    const axes = buildAxisObjects(this.grid, this.exaggeration);
    this.axes = axes.object;
    this.axisLabels = axes.labels;
    this.scene.add(this.axes);
    this.rebuildHazard();
    this.rebuildMarkers();
    this.rebuildOutlines();
    this.rebuildDrapePlane();
  }

  private rebuildHazard(): void {
    if (this.hazardMesh) {
      (this.hazardMesh.material as MeshBasicMaterial).map?.dispose();
      this.removeObject(this.hazardMesh);
      this.hazardMesh = null;
    }
    if (!this.grid || !this.hazardMask || !this.hazardVisible) return;
    // About 40 stripes across the terrain, whatever its size.
    const span = (this.grid.width - 1) * this.grid.pixelSize_m;
    const geometry = buildHazardGeometry(this.grid, this.hazardMask, { exaggeration: this.exaggeration, lift_m: 1, stripe_m: span / 40 });
    this.hazardMesh = new Mesh(geometry, new MeshBasicMaterial({ map: hazardStripeTexture(), transparent: true, depthWrite: false }));
    this.scene.add(this.hazardMesh);
  }

  private rebuildMarkers(): void {
    for (const m of this.markers) this.removeObject(m);
    this.markers = this.grid
      ? buildMarkerObjects(this.grid, this.exaggeration, { ignition: this.ignition, trajectories: this.trajectories, ellipse: this.ellipse, picks: this.picks, sites: this.sites, safeReachable: this.safeReachable })
      : [];
    for (const m of this.markers) this.scene.add(m);
  }


  private removeObject(object: Object3D | null): void {
    if (!object) return;
    this.scene.remove(object);
    const { geometry, material } = object as Partial<Mesh>;
    (geometry as BufferGeometry | undefined)?.dispose();
    (Array.isArray(material) ? material : material ? [material] : []).forEach((m: Material) => m.dispose());
  }
}
