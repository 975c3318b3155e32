import type { Candidate } from './candidate.js';

/*
 * Identity of a candidate for de-duplication: its topology and, in integer units, its lengths (sub-nm), gm/ID
 * (1e-4 /V) and setpoints (0.1 mV). Two candidates are the same when these agree, compared as numbers, no string
 * built: the searches look a candidate up per move and per screened candidate.
 */

// The candidate last quantised: the three array sizes, then the lengths, gm/IDs and setpoints in their units.
let scratch = new Float64Array(32);

/** A 30-bit hash (a small integer to V8) of the first `n` numbers of `q` (equal numbers, −0 and 0 included, hash alike). */
export function hashOf(q: ArrayLike<number>, n: number): number {
  let h = 0x811c9dc5;
  for (let j = 0; j < n; j++) {
    h = Math.imul(h ^ (q[j] | 0), 0x01000193);
    h ^= h >>> 15;
  }
  h = Math.imul(h ^ (h >>> 16), 0x85ebca6b);
  h = Math.imul(h ^ (h >>> 13), 0xc2b2ae35);
  return (h ^ (h >>> 16)) & 0x3fffffff;
}

/**
 * Dense ids of candidate identities, in the order first met: the first identity gets 0, the next new one 1, and so on.
 * Open addressing over the identities' hashes; a hash shared by two identities is told apart by their numbers.
 * Written for a short run, where most calls run unoptimised: few calls per lookup, indexed stores rather than push,
 * plain arrays rather than typed ones (a search makes many small sets, and a typed array's own store costs more to make
 * than they hold).
 */
export class CandidateIds {
  /** Per slot: an id + 1, or 0 when empty (at most half are full). */
  private slots: number[] = new Array<number>(16).fill(0);
  /** Per id: its hash, its topology, and where its numbers start in `numbers` (they end where the next id's start). */
  private hashes: number[] = [];
  private topologies: string[] = [];
  private starts: number[] = [0];
  private numbers: number[] = [];
  /** Hash and count of the numbers in `scratch`, from the last probe. */
  private hash = 0;
  private count = 0;

  get size(): number {
    return this.hashes.length;
  }

  /** The id of `c`'s identity, given now when it has none. */
  id(c: Candidate): number {
    const s = this.probe(c);
    const e = this.slots[s] - 1;
    return e >= 0 ? e : this.add(s, c.topology);
  }

  /** Whether `c`'s identity is met for the first time (it gets its id now): for keeping one candidate per identity. */
  fresh(c: Candidate): boolean {
    const count = this.hashes.length;
    return this.id(c) === count;
  }

  /** The id of `c`'s identity, −1 when it has none (and no id is given). */
  find(c: Candidate): number {
    return this.slots[this.probe(c)] - 1;
  }

  /** The slot of `c`'s identity: its own, else the empty one it would take. Leaves the identity in `scratch`. */
  private probe(c: Candidate): number {
    const l = c.l;
    const g = c.gmid;
    const v = c.setpoints;
    const n = 3 + l.length + g.length + v.length;
    if (n > scratch.length) scratch = new Float64Array(2 * n);
    const q = scratch;
    q[0] = l.length;
    q[1] = g.length;
    q[2] = v.length;
    let j = 3;
    for (let k = 0; k < l.length; k++) q[j++] = Math.round(l[k] * 1e10);
    for (let k = 0; k < g.length; k++) q[j++] = Math.round(g[k] * 1e4);
    for (let k = 0; k < v.length; k++) q[j++] = Math.round(v[k] * 1e4);
    const h = hashOf(q, n);
    this.hash = h;
    this.count = n;
    const slots = this.slots;
    const mask = slots.length - 1;
    for (let s = h & mask; ; s = (s + 1) & mask) {
      const e = slots[s] - 1;
      if (e < 0 || (this.hashes[e] === h && this.same(e, c.topology, n))) return s;
    }
  }

  /** Whether id `e` is the identity in `scratch` (its first `n` numbers) with `topology`: numbers equal, or both NaN. */
  private same(e: number, topology: string, n: number): boolean {
    if (this.topologies[e] !== topology) return false;
    const at = this.starts[e];
    if (this.starts[e + 1] - at !== n) return false;
    const numbers = this.numbers;
    for (let j = 0; j < n; j++) {
      const a = numbers[at + j];
      const b = scratch[j];
      if (a !== b && (a === a || b === b)) return false;
    }
    return true;
  }

  /** A new id for the identity in `scratch` (the last probed), in the empty slot `s`. */
  private add(s: number, topology: string): number {
    const e = this.hashes.length;
    const numbers = this.numbers;
    const at = numbers.length;
    const n = this.count;
    for (let j = 0; j < n; j++) numbers[at + j] = scratch[j];
    this.starts[e + 1] = at + n;
    this.hashes[e] = this.hash;
    this.topologies[e] = topology;
    this.slots[s] = e + 1;
    if (2 * e + 2 > this.slots.length) this.rehash(2 * this.slots.length);
    return e;
  }

  private rehash(size: number): void {
    const slots = new Array<number>(size).fill(0);
    const mask = size - 1;
    for (let e = 0; e < this.hashes.length; e++) {
      let s = this.hashes[e] & mask;
      while (slots[s] !== 0) s = (s + 1) & mask;
      slots[s] = e + 1;
    }
    this.slots = slots;
  }
}

/**
 * A map keyed by the ids of candidate identities: `key(c)` gives the key of `c` (the same for equal identities),
 * the Map methods take it.
 */
export class CandidateMap<V> extends Map<number, V> {
  private readonly ids = new CandidateIds();

  key(c: Candidate): number {
    return this.ids.id(c);
  }

  /** The key of `c`, −1 (no entry's key) when `key` never gave it one. */
  find(c: Candidate): number {
    return this.ids.find(c);
  }
}
