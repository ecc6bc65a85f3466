// The engines' memo tables: a hit returns the stored result without computing again, a table
// never holds more than its limit, and forgetMemos empties every table.
import { describe, expect, it } from 'vitest';
import { forgetMemos, memoTable } from '../../src/engines/memo.ts';

describe('memo tables', () => {
  it('compute a key once and serve it after', () => {
    const table = memoTable<string, number>(4);
    let runs = 0;
    const square = (x: number) => table.get(String(x), () => (runs++, x * x));
    expect([square(3), square(3), square(4)]).toEqual([9, 9, 16]);
    expect(runs).toBe(2);
    // Below its limit a table keeps every key: 3 is still served after 4 was added.
    expect([square(3), square(4)]).toEqual([9, 16]);
    expect(runs).toBe(2);
  });

  it('stay within their limit: the table empties when full, so an old key is computed again', () => {
    const table = memoTable<number, number>(2);
    let runs = 0;
    const get = (k: number) => table.get(k, () => (runs++, k));
    get(1);
    get(2);
    get(3); // full at two: emptied, then 3 stored
    expect(runs).toBe(3);
    get(3);
    expect(runs).toBe(3);
    get(1);
    expect(runs).toBe(4);
  });

  it('all forget at once', () => {
    const a = memoTable<number, number>(8);
    const b = memoTable<number, number>(8);
    let runs = 0;
    a.get(1, () => ++runs);
    b.get(1, () => ++runs);
    forgetMemos();
    a.get(1, () => ++runs);
    b.get(1, () => ++runs);
    expect(runs).toBe(4);
  });

  it('store a result of undefined like any other', () => {
    const table = memoTable<number, undefined>(2);
    let runs = 0;
    table.get(1, () => void runs++);
    table.get(1, () => void runs++);
    expect(runs).toBe(1);
  });
});
