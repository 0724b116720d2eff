/**
 * Undo/redo of immutable snapshots. Consecutive records with the same key (keystrokes in one field)
 * merge into a single step until `seal()` is called (the field loses focus or another field is
 * edited), so one undo takes a field back to what it held before the user started typing in it.
 */
export class History<T> {
  private past: T[] = [];
  private future: T[] = [];
  private openKey: string | null = null;

  constructor(
    private current: T,
    /** Undo depth kept; older steps are dropped. */
    private readonly limit = 500,
  ) {
    if (!Number.isInteger(limit) || limit < 1) throw new Error(`invalid history limit: ${limit} (must be a positive integer)`);
  }

  get present(): T {
    return this.current;
  }

  get canUndo(): boolean {
    return this.past.length > 0;
  }

  get canRedo(): boolean {
    return this.future.length > 0;
  }

  /** Make `next` the present. With the same `mergeKey` as the previous unsealed record, no new step. */
  record(next: T, mergeKey?: string): void {
    if (mergeKey !== undefined && mergeKey === this.openKey) {
      this.current = next;
      this.future = [];
      return;
    }
    this.past.push(this.current);
    if (this.past.length > this.limit) this.past.shift();
    this.current = next;
    this.future = [];
    this.openKey = mergeKey ?? null;
  }

  /** Close the current merge group. */
  seal(): void {
    this.openKey = null;
  }

  undo(): T | null {
    const previous = this.past.pop();
    if (previous === undefined) return null;
    this.future.push(this.current);
    this.current = previous;
    this.openKey = null;
    return previous;
  }

  redo(): T | null {
    const next = this.future.pop();
    if (next === undefined) return null;
    this.past.push(this.current);
    this.current = next;
    this.openKey = null;
    return next;
  }

  /** Start over from `state` with no steps (a study was opened or created). */
  reset(state: T): void {
    this.past = [];
    this.future = [];
    this.current = state;
    this.openKey = null;
  }
}
