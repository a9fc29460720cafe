/**
 * A minimal observable value that satisfies Svelte's store contract (`subscribe` calls the
 * listener at once and returns the unsubscribe function), so components read it as `$store`
 * while the logic around it stays plain TypeScript that vitest runs without a compiler.
 */
export type Listener<T> = (value: T) => void;

export interface Readable<T> {
  subscribe(listener: Listener<T>): () => void;
  get(): T;
}

export class Observable<T> implements Readable<T> {
  #value: T;
  #listeners = new Set<Listener<T>>();

  constructor(value: T) {
    this.#value = value;
  }

  get(): T {
    return this.#value;
  }

  set(value: T): void {
    this.#value = value;
    for (const l of [...this.#listeners]) l(value);
  }

  update(fn: (value: T) => T): void {
    this.set(fn(this.#value));
  }

  subscribe(listener: Listener<T>): () => void {
    this.#listeners.add(listener);
    listener(this.#value);
    return () => {
      this.#listeners.delete(listener);
    };
  }
}
