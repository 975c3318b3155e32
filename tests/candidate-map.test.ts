import { describe, expect, it } from 'vitest';
import { CandidateIds, CandidateMap, hashOf } from '../src/solve/search/candidate-map.js';
import type { Candidate } from '../src/solve/search/candidate.js';

// The string identity the ids stand for: "topology|L,…|gm/ID,…|setpoint,…" in sub-nm, 1e-4 /V and 0.1 mV units.
function stringKey(c: Candidate): string {
  const q = (xs: number[], unit: number) => xs.map((x) => String(Math.round(x * unit))).join(',');
  return `${c.topology}|${q(c.l, 1e10)}|${q(c.gmid, 1e4)}|${q(c.setpoints, 1e4)}`;
}

const cand = (topology: string, l: number[], gmid: number[], setpoints: number[]): Candidate =>
  ({ topology, l, gmid, setpoints }) as Candidate;

// Deterministic pseudo-random numbers (a linear congruential generator), so a failure repeats.
function random(seed: number): () => number {
  let s = seed;
  return () => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    return s / 2 ** 32;
  };
}

describe('candidate ids', () => {
  it('give two candidates one id exactly when their string identities are equal', () => {
    const r = random(7);
    const pick = <T>(xs: readonly T[]) => xs[Math.floor(r() * xs.length)];
    // Few values per coordinate, so many candidates repeat; each value nudged by up to a quarter of its unit, so
    // equal identities come from unequal numbers; and sizes vary, so the same numbers also fall into other arrays.
    const nudge = (x: number, unit: number) => x + ((r() - 0.5) / 2) * unit;
    const ids = new CandidateIds();
    const byString = new Map<string, number>();
    for (let i = 0; i < 20000; i++) {
      const c = cand(
        pick(['cascode', 'triple']),
        Array.from({ length: pick([0, 1, 2]) }, () => nudge(pick([1.8e-7, 3.6e-7, 1e-6]), 1e-10)),
        Array.from({ length: pick([0, 1, 2]) }, () => nudge(pick([5, 10.25, 15]), 1e-4)),
        Array.from({ length: pick([0, 1, 2]) }, () => nudge(pick([0.1, 0.2]), 1e-4)),
      );
      const k = stringKey(c);
      // fresh: true exactly for a string key not met before (and it gives the id as id() would).
      const isNew = i % 2 === 0 ? ids.fresh(c) : undefined;
      if (isNew !== undefined) expect(isNew).toBe(!byString.has(k));
      const id = ids.id(c);
      if (!byString.has(k)) {
        // A new identity takes the next id (and none of the earlier ones).
        expect(id).toBe(byString.size);
        byString.set(k, id);
      } else expect(id).toBe(byString.get(k));
    }
    expect(ids.size).toBe(byString.size);
    expect(byString.size).toBeGreaterThan(1000);
  });

  it('tell apart candidates whose hashes collide', () => {
    // Setpoints 2^32 units apart hash alike (the hash reads 32-bit integers), as do NaN and 0.
    const a = cand('cascode', [1.8e-7], [10], [0.1]);
    const b = cand('cascode', [1.8e-7], [10], [(1000 + 2 ** 32) / 1e4]);
    expect(Math.round(b.setpoints[0] * 1e4) - Math.round(a.setpoints[0] * 1e4)).toBe(2 ** 32);
    const numbers = (c: Candidate) => [1, 1, 1, Math.round(c.l[0] * 1e10), Math.round(c.gmid[0] * 1e4), Math.round(c.setpoints[0] * 1e4)];
    expect(hashOf(numbers(a), 6)).toBe(hashOf(numbers(b), 6));
    const zero = cand('cascode', [1.8e-7], [10], [0]);
    const nan = cand('cascode', [1.8e-7], [10], [NaN]);
    expect(hashOf(numbers(zero), 6)).toBe(hashOf(numbers(nan), 6));

    const ids = new CandidateIds();
    expect([a, b, zero, nan].map((c) => ids.id(c))).toEqual([0, 1, 2, 3]);
    // Each is found again under its own id, also through a colliding twin (equal after quantisation).
    expect(ids.id(cand('cascode', [1.8e-7], [10], [0.10000001]))).toBe(0);
    expect(ids.find(b)).toBe(1);
    expect(ids.id(cand('cascode', [1.8e-7], [10], [-0]))).toBe(2);
    expect(ids.id(cand('cascode', [1.8e-7], [10], [NaN]))).toBe(3);
    expect(ids.size).toBe(4);
  });

  it('tell apart the same numbers under another topology or in other arrays', () => {
    const ids = new CandidateIds();
    const same = [
      cand('cascode', [1e-7], [], []),
      cand('triple', [1e-7], [], []),
      cand('cascode', [], [0.1], []),
      cand('cascode', [], [], [0.1]),
    ];
    expect(same.map((c) => ids.id(c))).toEqual([0, 1, 2, 3]);
  });

  it('keep every id through growth, and find gives none to a new identity', () => {
    const ids = new CandidateIds();
    const all = Array.from({ length: 5000 }, (_, i) => cand('cascode', [1.8e-7 * (1 + (i % 7))], [5 + (i % 50) * 0.25], [0.05 + Math.floor(i / 350) * 0.025]));
    all.forEach((c, i) => expect(ids.id(c)).toBe(i));
    all.forEach((c, i) => expect(ids.find(c)).toBe(i));
    expect(ids.find(cand('cascode', [1.8e-7], [5], [0.04]))).toBe(-1);
    expect(ids.size).toBe(5000);
  });
});

describe('candidate map', () => {
  it('keys equal identities alike and keeps Map order', () => {
    const m = new CandidateMap<string>();
    const a = cand('cascode', [1.8e-7], [10], [0.1]);
    const b = cand('cascode', [3.6e-7], [10], [0.1]);
    m.set(m.key(b), 'b');
    m.set(m.key(a), 'a');
    m.set(m.key(cand('cascode', [1.8e-7 + 1e-12], [10.00001], [0.1])), 'a again');
    expect([...m.values()]).toEqual(['b', 'a again']);
    expect(m.find(cand('cascode', [7.2e-7], [10], [0.1]))).toBe(-1);
    expect(m.get(m.find(a))).toBe('a again');
  });
});
