// Reading ahead: finished tiles of ground the user is likely to move to next (the screens
// beside the view), made while the render workers have nothing else to do, and handed to
// the map when it asks for them. Tiles the map asks for always come first: read-ahead
// starts only while no asked-for tile is being made, and at most `IN_FLIGHT` at a time,
// so a jump elsewhere (or a zoom) waits for two tiles at most.

export type TileLoader<T> = (z: number, x: number, y: number, signal: AbortSignal) => Promise<T>;

const IN_FLIGHT = 2;

/** Asked-for tiles being made, over every layer (they share one worker pool). */
let demand = 0;
const warmers = new Set<TileWarmer<unknown>>();

function pumpAll(): void {
  for (const warmer of warmers) warmer.pump();
}

interface Warm<T> {
  abort: AbortController;
  /** null while queued, the tile's promise once started */
  tile: Promise<T> | null;
}

export class TileWarmer<T> {
  readonly #load: TileLoader<T>;
  readonly #capacity: number;
  /** Read-ahead tiles by key, oldest first: queued, in flight or made. */
  readonly #warm = new Map<string, Warm<T>>();
  #inFlight = 0;

  /** `capacity`: the most read-ahead tiles kept at once (made or coming). */
  constructor(load: TileLoader<T>, capacity = 128) {
    this.#load = load;
    this.#capacity = capacity;
    warmers.add(this as TileWarmer<unknown>);
  }

  /** A tile the map asks for: the read-ahead one when there is one, else made now. */
  load(z: number, x: number, y: number, signal: AbortSignal): Promise<T> {
    const key = `${z}/${x}/${y}`;
    const warm = this.#warm.get(key);
    if (warm?.tile) {
      this.#warm.delete(key);
      return warm.tile;
    }
    if (warm) this.#warm.delete(key); // queued, not started: made now, as asked
    demand++;
    const tile = this.#load(z, x, y, signal);
    const done = () => {
      demand--;
      pumpAll();
    };
    tile.then(done, done);
    return tile;
  }

  /**
   * The tiles to read ahead now, most wanted first (at most `capacity`): those already
   * queued or made are kept, the rest are let go, since the view they were for is left.
   */
  warm(coords: Iterable<readonly [number, number, number]>): void {
    const wanted = new Map<string, Warm<T>>();
    for (const [z, x, y] of coords) {
      if (wanted.size >= this.#capacity) break;
      const key = `${z}/${x}/${y}`;
      if (!wanted.has(key)) wanted.set(key, this.#warm.get(key) ?? { abort: new AbortController(), tile: null });
    }
    for (const key of [...this.#warm.keys()]) if (!wanted.has(key)) this.#drop(key);
    this.#warm.clear();
    for (const [key, warm] of wanted) this.#warm.set(key, warm);
    this.pump();
  }

  /** How many read-ahead tiles are queued, in flight or made. */
  get size(): number {
    return this.#warm.size;
  }

  /** Starts queued read-ahead while nothing asked-for is being made. */
  pump(): void {
    if (demand > 0) return;
    for (const [key, warm] of this.#warm) {
      if (this.#inFlight >= IN_FLIGHT) return;
      if (warm.tile) continue;
      const [z, x, y] = key.split('/').map(Number);
      this.#inFlight++;
      warm.tile = this.#load(z, x, y, warm.abort.signal);
      const settle = () => {
        this.#inFlight--;
        this.pump();
      };
      warm.tile.then(settle, () => {
        // A failed read-ahead is forgotten: the map asks again and hears the failure itself.
        if (this.#warm.get(key) === warm) this.#warm.delete(key);
        settle();
      });
    }
  }

  /** Lets every read-ahead tile go (the layer is closed). */
  dispose(): void {
    for (const key of [...this.#warm.keys()]) this.#drop(key);
    warmers.delete(this as TileWarmer<unknown>);
  }

  #drop(key: string): void {
    const warm = this.#warm.get(key);
    if (!warm) return;
    this.#warm.delete(key);
    warm.abort.abort();
    // A made tile that is let go frees its bitmap at once rather than at the next collection.
    void warm.tile?.then((tile) => (tile as { close?: () => void }).close?.(), () => {});
  }
}
