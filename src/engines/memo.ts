// Bounded memo tables for engine results that several quantities (or many calls) share: the fill
// march, the collapse beam, Gauss–Legendre rules. A table empties whole when it outgrows its
// limit, so memory stays bounded whatever a handbook asks. Results depend only on the key, so a
// hit returns what the computation would have; `forgetMemos` empties every table, for tests that
// must see each computation run (DEVELOPERS.md, "Mutation testing": a result served from a table
// hides the code behind it from the per-test coverage that decides which tests run for a mutant).

const tables = new Set<Map<unknown, unknown>>();

export interface MemoTable<K, V> {
  /** The stored result for `key`, or `compute()`'s, stored for next time. */
  get(key: K, compute: () => V): V;
}

export function memoTable<K, V>(limit: number): MemoTable<K, V> {
  const map = new Map<K, V>();
  tables.add(map as Map<unknown, unknown>);
  return {
    get(key, compute) {
      if (map.has(key)) return map.get(key) as V;
      const value = compute();
      if (map.size >= limit) map.clear();
      map.set(key, value);
      return value;
    },
  };
}

/** Empty every memo table (tests only: engines never need it). */
export function forgetMemos(): void {
  for (const map of tables) map.clear();
}
