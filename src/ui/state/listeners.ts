/** A plain list of callbacks, for objects outside Svelte's reactivity (the map). */
export class Listeners<T extends unknown[]> {
  readonly #all = new Set<(...args: T) => void>();

  add(listener: (...args: T) => void): () => void {
    this.#all.add(listener);
    return () => this.#all.delete(listener);
  }

  emit(...args: T): void {
    for (const listener of this.#all) listener(...args);
  }

  clear(): void {
    this.#all.clear();
  }
}

/** The time now, ISO 8601 UTC. */
export function nowIso(): string {
  return new Date().toISOString();
}
