/**
 * The workspace's input state, independent of Svelte: everything the user edits — the study as typed, the
 * footprint grid, the terrain settings and the trade studies' own inputs — in ONE undo history, with their
 * checks, the file the study belongs to and whether it has unsaved changes. Components subscribe and render
 * `snapshot()`; tests drive it directly. What an undo step changed is derived by comparing the two states
 * (describeChange), never remembered beside them, so it cannot disagree with what the step did.
 */
import { History } from './history.ts';
import { StudyFormatError, type CrossIssue, type RawValues, type StudyModel, type Values } from '../study/study-model.ts';
import { DEFAULT_RUN_SETTINGS, type RunSettingsText } from '../compute/run-settings.ts';
import { DEFAULT_TERRAIN_SETTINGS, TERRAIN_FIELD_LABELS, TERRAIN_FIELD_UNITS, type TerrainSettingsText } from '../terrain/terrain-settings.ts';
import type { StudyInputs, StudyKind } from '../studies/study-inputs.ts';

/** The run inputs the user edits beside the study (not part of the study file). */
export interface RunInputs {
  /** The footprint grid, as typed. */
  run: RunSettingsText;
  /** Terrain placement and hazard limits, as typed. */
  terrain: TerrainSettingsText;
  /** The trade studies' fields the user typed, per study; a field absent here follows the study's defaults. */
  studies: TypedStudyInputs;
}

export type TypedStudyInputs = { [K in StudyKind]?: Partial<StudyInputs[K]> };

/** A study's inputs: the fields typed, the rest from the defaults of the study open now. */
export function studyInputsWith(defaults: StudyInputs, typed: TypedStudyInputs): StudyInputs {
  return {
    reserve: { ...defaults.reserve, ...typed.reserve },
    'ignition-altitude': { ...defaults['ignition-altitude'], ...typed['ignition-altitude'] },
    dispersion: { ...defaults.dispersion, ...typed.dispersion },
  };
}

export interface Draft extends RunInputs {
  name: string;
  raw: RawValues;
}

const RUN_FIELD_LABELS: Record<keyof RunSettingsText, string> = { side: 'Grid › Targets per side', halfWidth_m: 'Grid › Half-width' };
const STUDY_TITLES: Record<StudyKind, string> = { reserve: 'Reserve study', 'ignition-altitude': 'Ignition-altitude study', dispersion: 'Dispersion study' };
/** Field names as the study forms label them (renderer/studies/StudyForm.svelte). */
const STUDY_FIELD_LABELS: Record<string, string> = {
  reserves_kg: 'Reserves', altitudes_m: 'Ignition altitudes', rule: 'Ignition state rule', reserve_kg: 'Reserve kept',
  requiredRadius_m: 'Required divert radius', method: 'Method', directions: 'Directions', samples: 'Samples', seed: 'Seed',
  probability: 'Ellipse probability', sigmaPosition_m: 'Position 1σ per axis', sigmaVelocity_mps: 'Velocity 1σ per axis',
  sigmaMass_kg: 'Mass 1σ', sigmaThrust: 'Thrust 1σ', sigmaIsp: 'Isp 1σ', reachSamples: 'Reach-map footprints',
};

export interface FieldStatus {
  severity: 'error' | 'warning';
  message: string;
}

export interface WorkspaceSnapshot {
  draft: Draft;
  /** Problems per field id; fields without problems are absent. */
  problems: Record<string, FieldStatus>;
  errorCount: number;
  warningCount: number;
  dirty: boolean;
  canUndo: boolean;
  canRedo: boolean;
  /** File name shown in the title, or null for a study never saved. */
  fileName: string | null;
  /** Fields a loaded file lacked (filled with defaults), to tell the user once. */
  filledFromDefaults: string[];
}

const DRAFT_FORMAT = 'landreach-draft';

export class Workspace {
  private history: History<Draft>;
  private saved: Draft;
  private fileName: string | null = null;
  private filled: string[] = [];
  private listeners = new Set<() => void>();

  constructor(private readonly model: StudyModel) {
    const initial: Draft = { name: 'Untitled study', raw: model.defaults(), run: { ...DEFAULT_RUN_SETTINGS }, terrain: { ...DEFAULT_TERRAIN_SETTINGS }, studies: {} };
    this.history = new History(initial);
    this.saved = initial;
  }

  subscribe(listener: () => void): () => void {
    this.listeners.add(listener);
    return () => this.listeners.delete(listener);
  }

  private changed(): void {
    for (const listener of this.listeners) listener();
  }

  get draft(): Draft {
    return this.history.present;
  }

  edit(fieldId: string, raw: string): void {
    this.model.field(fieldId); // unknown ids are a program error
    const draft = this.draft;
    if (draft.raw[fieldId] === raw) return;
    // Touched by the user: no longer just a default filled in for a missing value.
    this.filled = this.filled.filter((id) => id !== fieldId);
    this.history.record({ ...draft, raw: { ...draft.raw, [fieldId]: raw } }, `field:${fieldId}`);
    this.changed();
  }

  /** Set several fields at once (a preset) as one undoable step. Unknown ids are a program error. */
  applyValues(values: Record<string, string>): void {
    // Only input fields are applied: the parts of the document the model carries alongside (names…)
    // are the study's own, not a preset's.
    const carried = new Set(Object.keys(this.model.defaults()).filter((id) => !this.model.fields.some((f) => f.id === id)));
    const fields = Object.fromEntries(Object.entries(values).filter(([id]) => !carried.has(id)));
    for (const id of Object.keys(fields)) this.model.field(id);
    const raw = { ...this.draft.raw, ...fields };
    if (this.model.fields.every((f) => raw[f.id] === this.draft.raw[f.id])) return;
    this.history.seal();
    this.history.record({ ...this.draft, raw });
    this.changed();
  }

  rename(name: string): void {
    if (this.draft.name === name) return;
    this.history.record({ ...this.draft, name }, 'name');
    this.changed();
  }

  /** The footprint grid as typed; one step per field typing burst. */
  editRun(field: keyof RunSettingsText, value: string): void {
    if (this.draft.run[field] === value) return;
    this.history.record({ ...this.draft, run: { ...this.draft.run, [field]: value } }, `run:${field}`);
    this.changed();
  }

  /** Terrain placement or hazard limits as typed; one step per field typing burst. */
  editTerrain(field: keyof TerrainSettingsText, value: string): void {
    if (this.draft.terrain[field] === value) return;
    this.history.record({ ...this.draft, terrain: { ...this.draft.terrain, [field]: value } }, `terrain:${field}`);
    this.changed();
  }

  /** One trade-study field as typed; one step per field typing burst. */
  editStudyInput(kind: StudyKind, field: string, value: string): void {
    const typed = (this.draft.studies[kind] ?? {}) as Record<string, string>;
    if (typed[field] === value) return;
    this.history.record({ ...this.draft, studies: { ...this.draft.studies, [kind]: { ...typed, [field]: value } } }, `study:${kind}:${field}`);
    this.changed();
  }

  /**
   * A change the application makes to the run inputs (a new DEM re-centres the target and fits the grid):
   * one undoable step like the user's own, so undo never skips over it.
   */
  adjustRunInputs(next: Partial<RunInputs>): void {
    const draft = { ...this.draft, ...next };
    if (describeChange(this.draft, draft, this.model) === null) return;
    this.history.seal();
    this.history.record(draft);
    this.history.seal();
    this.changed();
  }

  /** End the current typing burst (blur / change event). */
  seal(): void {
    this.history.seal();
  }

  /** Take back the last step; what it changed ("Vehicle › Dry mass 900 → 1000 kg"), or null with nothing to undo. */
  undo(): string | null {
    const before = this.draft;
    const after = this.history.undo();
    if (after === null) return null;
    this.changed();
    return describeChange(before, after, this.model) ?? 'nothing visible';
  }

  /** Do the undone step again; what it changed, or null with nothing to redo. */
  redo(): string | null {
    const before = this.draft;
    const after = this.history.redo();
    if (after === null) return null;
    this.changed();
    return describeChange(before, after, this.model) ?? 'nothing visible';
  }

  /** Parsed values of the fields that are valid on their own. */
  values(): Values {
    const out: Values = {};
    for (const f of this.model.fields) {
      const check = this.model.checkField(f.id, this.draft.raw[f.id] ?? '');
      if (check.ok) out[f.id] = check.value;
    }
    return out;
  }

  problems(): Record<string, FieldStatus> {
    const problems: Record<string, FieldStatus> = {};
    for (const f of this.model.fields) {
      const check = this.model.checkField(f.id, this.draft.raw[f.id] ?? '');
      if (!check.ok) problems[f.id] = { severity: 'error', message: check.message };
    }
    // Cross-field rules only speak when their own fields are valid, and never hide a field's own error.
    for (const issue of this.model.crossIssues(this.values()) as CrossIssue[]) {
      if (!problems[issue.field]) problems[issue.field] = { severity: issue.severity, message: issue.message };
    }
    for (const id of this.filled) {
      if (problems[id]) continue;
      const spec = this.model.field(id);
      problems[id] = { severity: 'warning', message: `Not in the opened file: the default ${this.draft.raw[id]}${spec.unit ? ` ${spec.unit}` : ''} was filled in. Check it, or type the value you mean.` };
    }
    return problems;
  }

  get dirty(): boolean {
    const a = this.draft;
    const b = this.saved;
    return a.name !== b.name || this.model.fields.some((f) => a.raw[f.id] !== b.raw[f.id]);
  }

  snapshot(): WorkspaceSnapshot {
    const problems = this.problems();
    const list = Object.values(problems);
    return {
      draft: this.draft,
      problems,
      errorCount: list.filter((p) => p.severity === 'error').length,
      warningCount: list.filter((p) => p.severity === 'warning').length,
      dirty: this.dirty,
      canUndo: this.history.canUndo,
      canRedo: this.history.canRedo,
      fileName: this.fileName,
      filledFromDefaults: this.filled,
    };
  }

  /** The study file's text, or the list of problems that must be fixed first (nothing is lost: see draftText). */
  studyText(): { ok: true; text: string } | { ok: false; message: string } {
    const errors = Object.entries(this.problems()).filter(([, p]) => p.severity === 'error');
    if (errors.length) {
      const labels = errors.map(([id]) => this.model.field(id).label);
      return { ok: false, message: `Not saved: ${labels.length} input${labels.length > 1 ? 's need' : ' needs'} fixing first (${labels.join(', ')}). Your edits are kept.` };
    }
    return { ok: true, text: JSON.stringify(this.model.toDocument(this.draft.name, this.values(), this.draft.raw), null, 2) + '\n' };
  }

  /** The run inputs as typed: kept when a study is opened or created (they are not part of the file). */
  runInputs(): RunInputs {
    const { run, terrain, studies } = this.draft;
    return { run, terrain, studies };
  }

  /** Everything as typed, valid or not: the crash-recovery copy. */
  draftText(): string {
    const { name, raw } = this.draft;
    return JSON.stringify({ format: DRAFT_FORMAT, fileName: this.fileName, name, raw });
  }

  /** "Group › Label" of a field, for messages. */
  fieldName(id: string): string {
    const spec = this.model.field(id);
    const group = this.model.groups.find((g) => g.id === spec.group);
    return `${group?.title ?? spec.group} › ${spec.label}`;
  }

  markSaved(fileName: string): void {
    this.saved = this.draft;
    this.fileName = fileName;
    this.filled = [];
    this.changed();
  }

  newStudy(): void {
    const fresh = { ...this.runInputs(), name: 'Untitled study', raw: this.model.defaults() };
    this.history.reset(fresh);
    this.saved = fresh;
    this.fileName = null;
    this.filled = [];
    this.changed();
  }

  /** Load a study file's text; throws StudyFormatError (with a user-facing message) and changes nothing. */
  open(text: string, fileName: string): void {
    const content = this.model.fromText(text);
    const draft = { ...this.runInputs(), name: content.name, raw: content.raw };
    this.history.reset(draft);
    this.saved = draft;
    this.fileName = fileName;
    this.filled = content.missing ?? [];
    this.changed();
  }

  /** Restore a crash-recovery copy: it stays unsaved (dirty) until the user saves it. */
  restoreDraft(text: string): void {
    let doc: { format?: unknown; name?: unknown; raw?: unknown; fileName?: unknown };
    try {
      doc = JSON.parse(text) as typeof doc;
    } catch {
      throw new StudyFormatError('The recovery copy is damaged and cannot be restored.');
    }
    if (doc.format !== DRAFT_FORMAT || typeof doc.raw !== 'object' || doc.raw === null) {
      throw new StudyFormatError('The recovery copy is damaged and cannot be restored.');
    }
    const raw = this.model.defaults();
    // Every key the model knows (its fields and any document parts it carries in the raw values).
    for (const id of Object.keys(raw)) {
      const value = (doc.raw as Record<string, unknown>)[id];
      if (typeof value === 'string') raw[id] = value;
    }
    const name = typeof doc.name === 'string' ? doc.name : 'Recovered study';
    this.history.reset({ ...this.runInputs(), name, raw });
    this.saved = { ...this.runInputs(), name: '', raw: {} };
    this.fileName = typeof doc.fileName === 'string' ? doc.fileName : null;
    this.filled = [];
    this.changed();
  }
}

const arrow = (a: string, b: string) => `${a.trim() === '' ? '(empty)' : a} → ${b.trim() === '' ? '(empty)' : b}`;

/**
 * What changed from `before` to `after`, in the words of the panels: "Grid › Half-width 500 → 800", or
 * "3 inputs (Vehicle › Dry mass, …)" for a step that set several at once (a preset); null when nothing did.
 */
export function describeChange(before: Draft, after: Draft, model: StudyModel): string | null {
  const changes: { name: string; detail: string }[] = [];
  if (before.name !== after.name) changes.push({ name: 'Study name', detail: arrow(before.name, after.name) });
  for (const f of model.fields) {
    const a = before.raw[f.id] ?? '';
    const b = after.raw[f.id] ?? '';
    if (a === b) continue;
    const group = model.groups.find((g) => g.id === f.group);
    changes.push({ name: `${group?.title ?? f.group} › ${f.label}`, detail: `${arrow(a, b)}${f.unit ? ` ${f.unit}` : ''}` });
  }
  for (const k of Object.keys(RUN_FIELD_LABELS) as (keyof RunSettingsText)[]) {
    if (before.run[k] !== after.run[k]) changes.push({ name: RUN_FIELD_LABELS[k], detail: `${arrow(before.run[k], after.run[k])}${k === 'halfWidth_m' ? ' m' : ''}` });
  }
  for (const k of Object.keys(TERRAIN_FIELD_LABELS) as (keyof TerrainSettingsText)[]) {
    if (before.terrain[k] !== after.terrain[k]) changes.push({ name: `Terrain › ${TERRAIN_FIELD_LABELS[k]}`, detail: `${arrow(before.terrain[k], after.terrain[k])} ${TERRAIN_FIELD_UNITS[k]}` });
  }
  for (const kind of Object.keys(STUDY_TITLES) as StudyKind[]) {
    const a = (before.studies[kind] ?? {}) as Record<string, string>;
    const b = (after.studies[kind] ?? {}) as Record<string, string>;
    for (const k of new Set([...Object.keys(a), ...Object.keys(b)])) {
      if (a[k] === b[k]) continue;
      // A field never typed follows the study's default.
      const detail = `${a[k] === undefined ? '(default)' : a[k].trim() || '(empty)'} → ${b[k] === undefined ? '(default)' : b[k].trim() || '(empty)'}`;
      changes.push({ name: `${STUDY_TITLES[kind]} › ${STUDY_FIELD_LABELS[k] ?? k}`, detail });
    }
  }
  if (changes.length === 0) return null;
  if (changes.length === 1) return `${changes[0].name} ${changes[0].detail}`;
  const names = changes.slice(0, 3).map((c) => c.name).join(', ');
  return `${changes.length} inputs (${names}${changes.length > 3 ? ', …' : ''})`;
}
