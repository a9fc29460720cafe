/**
 * Undo/redo over immutable snapshots: the present value, a stack of earlier values and a
 * stack of undone ones. Every edit pushes the new snapshot (with a label for the menu) and
 * clears the redo stack; the oldest entries drop off past `limit`.
 */
export interface HistoryEntry<T> {
  value: T;
  /** What the edit that produced this value did ("Add burn"). */
  label: string;
  /** Increases with every push; identifies a snapshot (the saved one, for the unsaved marker). */
  revision: number;
}

export const HISTORY_LIMIT = 200;

export class History<T> {
  #past: HistoryEntry<T>[] = [];
  #future: HistoryEntry<T>[] = [];
  #present: HistoryEntry<T>;
  #next = 1;

  constructor(
    initial: T,
    readonly limit = HISTORY_LIMIT,
  ) {
    this.#present = { value: initial, label: '', revision: 0 };
  }

  get present(): T {
    return this.#present.value;
  }

  get revision(): number {
    return this.#present.revision;
  }

  get canUndo(): boolean {
    return this.#past.length > 0;
  }

  get canRedo(): boolean {
    return this.#future.length > 0;
  }

  /** Label of the edit Undo would take back, or null. */
  get undoLabel(): string | null {
    return this.canUndo ? this.#present.label : null;
  }

  get redoLabel(): string | null {
    return this.canRedo ? this.#future[this.#future.length - 1].label : null;
  }

  push(value: T, label: string): void {
    this.#past.push(this.#present);
    if (this.#past.length > this.limit) this.#past.splice(0, this.#past.length - this.limit);
    this.#present = { value, label, revision: this.#next++ };
    this.#future = [];
  }

  undo(): boolean {
    const prev = this.#past.pop();
    if (!prev) return false;
    this.#future.push(this.#present);
    this.#present = prev;
    return true;
  }

  redo(): boolean {
    const next = this.#future.pop();
    if (!next) return false;
    this.#past.push(this.#present);
    this.#present = next;
    return true;
  }

  /** Starts over from `value` (a newly opened document): no undo, no redo. */
  reset(value: T): void {
    this.#past = [];
    this.#future = [];
    this.#present = { value, label: '', revision: this.#next++ };
  }
}
