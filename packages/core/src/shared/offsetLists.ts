/**
 * Groups items by an integer key into compressed lists (the offset-array form of an adjacency):
 * the items with key b are `list[start[b]] … list[start[b + 1] − 1]`, in item order; an item whose
 * key is −1 is left out. The arrays are the caller's, so that a hot loop reuses them.
 *
 * @param keys - key of item i at `keys[i]`, in [0, buckets) or −1
 * @param count - number of items (the first `count` keys are read)
 * @param buckets - number of keys
 * @param start - output, length ≥ buckets + 1
 * @param list - output, length ≥ the number of items kept
 * @param cursor - scratch, length ≥ buckets
 * @example
 * ```ts
 * const start = new Int32Array(3), list = new Int32Array(3);
 * offsetLists(Int32Array.of(1, 0, 1), 3, 2, start, list, new Int32Array(2)); // start [0, 1, 3], list [1, 0, 2]
 * ```
 */
export function offsetLists(keys: Int32Array, count: number, buckets: number, start: Int32Array, list: Int32Array, cursor: Int32Array): void {
  start.fill(0, 0, buckets + 1);
  for (let i = 0; i < count; i++) {
    const k = keys[i] as number;
    if (k >= 0) start[k + 1] = (start[k + 1] as number) + 1;
  }
  for (let b = 0; b < buckets; b++) start[b + 1] = (start[b + 1] as number) + (start[b] as number);
  cursor.set(start.subarray(0, buckets));
  for (let i = 0; i < count; i++) {
    const k = keys[i] as number;
    if (k < 0) continue;
    list[cursor[k] as number] = i;
    cursor[k] = (cursor[k] as number) + 1;
  }
}
