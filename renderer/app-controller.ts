/**
 * File actions of the workspace (new, open, save, save as, autosave, crash recovery) as plain code
 * over the bridge and the workspace, so they are tested without a browser. The Svelte app calls these
 * and shows the notices they raise.
 */
import type { LandreachBridge, OpenStudyResult, RecoveryCopy } from '../electron/bridge-api.ts';
import { StudyFormatError } from './study/study-model.ts';
import type { Workspace } from './state/workspace.ts';

export interface Notice {
  kind: 'info' | 'warning' | 'error';
  text: string;
}

export interface ControllerHooks {
  notify(notice: Notice): void;
  /** Ask whether unsaved changes may be discarded; resolves true to go ahead. */
  confirmDiscard(action: string): Promise<boolean>;
}

/** A file name from a study name: letters, digits, dashes; never empty. */
export function suggestedFileName(studyName: string): string {
  const slug = studyName
    .normalize('NFKD')
    .replace(/[\u0300-\u036f]/g, '')
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '')
    .slice(0, 80);
  return slug || 'study';
}

export class AppController {
  private lastAutosave: string | null = null;
  private lastDocumentState = '';

  constructor(
    private readonly workspace: Workspace,
    private readonly bridge: LandreachBridge,
    private readonly hooks: ControllerHooks,
  ) {}

  private async mayDiscard(action: string): Promise<boolean> {
    return !this.workspace.dirty || this.hooks.confirmDiscard(action);
  }

  private load(result: OpenStudyResult): void {
    if (result.status === 'cancelled') return;
    if (result.status === 'error') {
      this.hooks.notify({ kind: 'error', text: result.message });
      return;
    }
    try {
      this.workspace.open(result.text, result.name);
    } catch (error) {
      if (!(error instanceof StudyFormatError)) throw error;
      this.hooks.notify({ kind: 'error', text: `${result.name} was not opened: ${error.message} Your current study is unchanged.` });
      return;
    }
    const filled = this.workspace.snapshot().filledFromDefaults;
    if (filled.length) {
      const shown = filled.slice(0, 3).map((id) => this.workspace.fieldName(id));
      const more = filled.length > shown.length ? ` and ${filled.length - shown.length} more` : '';
      this.hooks.notify({
        kind: 'warning',
        text: `${result.name} lacked ${filled.length} input${filled.length > 1 ? 's' : ''} (${shown.join(', ')}${more}); defaults were filled in and marked. Check them before computing.`,
      });
    } else {
      this.hooks.notify({ kind: 'info', text: `Opened ${result.name}.` });
    }
  }

  async open(): Promise<void> {
    if (!(await this.mayDiscard('open another study'))) return;
    this.load(await this.bridge.openStudy());
  }

  async openRecent(path: string): Promise<void> {
    if (!(await this.mayDiscard('open another study'))) return;
    this.load(await this.bridge.openRecent(path));
  }

  async save(asNew = false): Promise<boolean> {
    const study = this.workspace.studyText();
    if (!study.ok) {
      this.hooks.notify({ kind: 'error', text: study.message });
      return false;
    }
    const name = suggestedFileName(this.workspace.draft.name);
    const result = asNew ? await this.bridge.saveStudyAs(study.text, name) : await this.bridge.saveStudy(study.text, name);
    if (result.status === 'cancelled') return false;
    if (result.status === 'error') {
      this.hooks.notify({ kind: 'error', text: result.message });
      return false;
    }
    this.workspace.markSaved(result.name);
    this.lastAutosave = null;
    await this.bridge.clearRecovery();
    this.hooks.notify({ kind: 'info', text: `Saved ${result.name}.` });
    return true;
  }

  async newStudy(): Promise<void> {
    if (!(await this.mayDiscard('start a new study'))) return;
    this.workspace.newStudy();
    this.lastAutosave = null;
    await this.bridge.newStudy();
    await this.bridge.clearRecovery();
  }

  /** Write a recovery copy if there are unsaved changes not yet copied. Returns whether it wrote. */
  async autosave(): Promise<boolean> {
    if (!this.workspace.dirty) return false;
    const text = this.workspace.draftText();
    if (text === this.lastAutosave) return false;
    await this.bridge.writeRecovery(text);
    this.lastAutosave = text;
    return true;
  }

  async pendingRecovery(): Promise<RecoveryCopy | null> {
    return this.bridge.readRecovery();
  }

  async restore(copy: RecoveryCopy): Promise<void> {
    try {
      this.workspace.restoreDraft(copy.text);
      this.hooks.notify({ kind: 'info', text: 'The unsaved study was restored. Save it to keep it.' });
    } catch (error) {
      if (!(error instanceof StudyFormatError)) throw error;
      this.hooks.notify({ kind: 'error', text: error.message });
    }
  }

  async discardRecovery(): Promise<void> {
    await this.bridge.clearRecovery();
  }

  /** Tell the shell the title and dirty flag, only when one of them changed (not on every keystroke). */
  async syncDocumentState(): Promise<void> {
    const state = { dirty: this.workspace.dirty, title: this.workspace.draft.name };
    const key = JSON.stringify(state);
    if (key === this.lastDocumentState) return;
    this.lastDocumentState = key;
    await this.bridge.setDocumentState(state);
  }
}
