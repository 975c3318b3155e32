/**
 * Keeps the `k` entries with the smallest keys (like heapq.nsmallest(k) fed one
 * at a time; non-finite keys are refused) (a bounded max-heap), so a
 * screen over millions of combinations stores only what it may keep.
 */
export class TopK<T> {
  private keys: number[] = [];
  private items: T[] = [];
  constructor(readonly k: number) {}

  /** True when an entry with this key would be kept; test before building the item. */
  accepts(key: number): boolean {
    return this.k > 0 && Number.isFinite(key) && (this.keys.length < this.k || key < this.keys[0]);
  }

  /** Largest kept key once full, else undefined. */
  worst(): number | undefined {
    return this.keys.length < this.k ? undefined : this.keys[0];
  }

  push(key: number, item: T): void {
    if (!this.accepts(key)) return;
    if (this.keys.length < this.k) {
      this.keys.push(key);
      this.items.push(item);
      this.up(this.keys.length - 1);
    } else {
      this.keys[0] = key;
      this.items[0] = item;
      this.down(0);
    }
  }

  /** Kept items, best (smallest key) first. */
  sorted(): T[] {
    return this.keys.map((key, i) => [key, i] as const).sort((a, b) => a[0] - b[0]).map(([, i]) => this.items[i]);
  }

  // Through temporaries: a destructuring swap builds an array in unoptimised code.
  private swap(a: number, b: number): void {
    const k = this.keys[a];
    this.keys[a] = this.keys[b];
    this.keys[b] = k;
    const t = this.items[a];
    this.items[a] = this.items[b];
    this.items[b] = t;
  }

  private up(i: number): void {
    while (i > 0) {
      const p = (i - 1) >> 1;
      if (this.keys[p] >= this.keys[i]) return;
      this.swap(p, i);
      i = p;
    }
  }

  private down(i: number): void {
    const n = this.keys.length;
    for (;;) {
      const l = 2 * i + 1;
      const r = l + 1;
      let m = i;
      if (l < n && this.keys[l] > this.keys[m]) m = l;
      if (r < n && this.keys[r] > this.keys[m]) m = r;
      if (m === i) return;
      this.swap(m, i);
      i = m;
    }
  }
}
