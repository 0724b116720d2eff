/**
 * The workspace's document state, independent of Svelte: the inputs as typed, their checks, undo
 * history, the file it belongs to and whether it has unsaved changes. Components subscribe and
 * render `snapshot()`; tests drive it directly.
 */
import { History } from './history.ts';
import { StudyFormatError, type CrossIssue, type RawValues, type StudyModel, type Values } from '../study/study-model.ts';

export interface Draft {
  name: string;
  raw: RawValues;
}

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
    const initial = { name: 'Untitled study', raw: model.defaults() };
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

  /** End the current typing burst (blur / change event). */
  seal(): void {
    this.history.seal();
  }

  undo(): boolean {
    const done = this.history.undo() !== null;
    if (done) this.changed();
    return done;
  }

  redo(): boolean {
    const done = this.history.redo() !== null;
    if (done) this.changed();
    return done;
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

  /** Everything as typed, valid or not: the crash-recovery copy. */
  draftText(): string {
    return JSON.stringify({ format: DRAFT_FORMAT, fileName: this.fileName, ...this.draft });
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
    const fresh = { name: 'Untitled study', raw: this.model.defaults() };
    this.history.reset(fresh);
    this.saved = fresh;
    this.fileName = null;
    this.filled = [];
    this.changed();
  }

  /** Load a study file's text; throws StudyFormatError (with a user-facing message) and changes nothing. */
  open(text: string, fileName: string): void {
    const content = this.model.fromText(text);
    const draft = { name: content.name, raw: content.raw };
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
    this.history.reset({ name, raw });
    this.saved = { name: '', raw: {} };
    this.fileName = typeof doc.fileName === 'string' ? doc.fileName : null;
    this.filled = [];
    this.changed();
  }
}
