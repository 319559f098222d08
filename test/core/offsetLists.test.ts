import { describe, expect, it } from 'vitest';
import { offsetLists } from '../../packages/core/src/shared/offsetLists.js';
import { fc, fcParams } from '../support/fc.js';

// The one offset-array builder (leg adjacency, the rating check's arcs, the triangulation's sort)
// against plain grouping: the same items per key, in item order, keys of −1 left out.
describe('offsetLists', () => {
  it('groups like a plain filter per key, in item order (seeded property)', () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 9 }), fc.array(fc.integer({ min: -1, max: 8 }), { maxLength: 40 }), (buckets, raw) => {
        const keys = Int32Array.from(raw.map((k) => (k < 0 ? -1 : k % buckets)));
        const start = new Int32Array(buckets + 1).fill(7);
        const list = new Int32Array(keys.length);
        offsetLists(keys, keys.length, buckets, start, list, new Int32Array(buckets));
        for (let b = 0; b < buckets; b++) {
          const want = [...keys.keys()].filter((i) => keys[i] === b);
          expect([...list.subarray(start[b] as number, start[b + 1] as number)]).toEqual(want);
        }
        expect(start[buckets]).toBe(keys.filter((k) => k >= 0).length);
      }),
      fcParams(200),
    );
  });

  it('reads only the first `count` keys (reused buffers)', () => {
    const start = new Int32Array(3);
    const list = new Int32Array(4);
    offsetLists(Int32Array.of(1, 0, 1, 0), 2, 2, start, list, new Int32Array(2));
    expect([...start]).toEqual([0, 1, 2]);
    expect([...list.subarray(0, 2)]).toEqual([1, 0]);
  });
});
