/** A binary min-heap of (key, value) number pairs; stale entries are skipped by the caller. */
export class MinHeap {
  /** The key of the pair `pop` removed last. */
  lastKey = 0;
  private keys: number[] = [];
  private values: number[] = [];
  get size() {
    return this.keys.length;
  }
  clear() {
    this.keys.length = 0;
    this.values.length = 0;
  }
  push(key: number, value: number) {
    const keys = this.keys;
    const values = this.values;
    let i = keys.length;
    keys.push(key);
    values.push(value);
    while (i > 0) {
      const parent = (i - 1) >> 1;
      if (keys[parent] <= key) break;
      keys[i] = keys[parent];
      values[i] = values[parent];
      i = parent;
    }
    keys[i] = key;
    values[i] = value;
  }
  /** Removes the smallest pair; returns its value, with its key in `lastKey`. */
  pop(): number {
    const keys = this.keys;
    const values = this.values;
    const topValue = values[0];
    this.lastKey = keys[0];
    const key = keys.pop()!;
    const value = values.pop()!;
    const n = keys.length;
    if (n > 0) {
      let i = 0;
      for (;;) {
        let child = 2 * i + 1;
        if (child >= n) break;
        if (child + 1 < n && keys[child + 1] < keys[child]) child++;
        if (keys[child] >= key) break;
        keys[i] = keys[child];
        values[i] = values[child];
        i = child;
      }
      keys[i] = key;
      values[i] = value;
    }
    return topValue;
  }
}
