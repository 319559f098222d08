/**
 * A small least-recently-used cache of immutable results of pure functions, keyed by strings that
 * describe the inputs completely. Values are frozen deeply when stored, so a caller cannot change
 * what another call will get.
 *
 * Why it exists: the same leg tables and polarity diagrams are asked for again and again — a review
 * report builds the plan, the table, the derating curve and every claim of one leg, and a fault
 * atlas meets the same three level sets under many faults — and each costs far more to build than
 * to look up.
 */
export class BoundedCache<V> {
  readonly #map = new Map<string, V>();
  readonly #limit: number;

  /**
   * @param limit - most entries kept; the least recently used goes first
   */
  constructor(limit: number) {
    this.#limit = limit;
  }

  /**
   * The value for a key, marking it recently used.
   *
   * @param key - the key
   * @returns the stored value or `undefined`
   */
  get(key: string): V | undefined {
    const v = this.#map.get(key);
    if (v !== undefined) {
      this.#map.delete(key);
      this.#map.set(key, v);
    }
    return v;
  }

  /**
   * Stores a value (frozen deeply), evicting the least recently used entry when full.
   *
   * @param key - the key
   * @param value - the value
   * @returns the cache
   */
  set(key: string, value: V): this {
    this.#map.delete(key);
    this.#map.set(key, deepFreeze(value));
    if (this.#map.size > this.#limit) this.#map.delete(this.#map.keys().next().value as string);
    return this;
  }

  /**
   * The value for a key, made (and stored, frozen) on the first ask.
   *
   * @param key - the key
   * @param make - computes the value when the key is not stored
   * @returns the stored value
   * @example
   * ```ts
   * const sectors = SECTORS.through(`${load}|${margin}`, () => polaritySectors(load, margin));
   * ```
   */
  through(key: string, make: () => V): V {
    const known = this.get(key);
    if (known !== undefined) return known;
    const v = make();
    this.set(key, v);
    return v;
  }

  /** Number of entries. */
  get size(): number {
    return this.#map.size;
  }
}

/**
 * Freezes an object graph of plain data (objects and arrays; functions, Maps, Sets and typed arrays
 * are left as they are).
 *
 * @param v - the value
 * @returns the same value, frozen
 * @example
 * ```ts
 * deepFreeze({ a: [1, 2] }).a.push(3); // TypeError in strict mode
 * ```
 */
export function deepFreeze<T>(v: T): T {
  const stack: unknown[] = [v];
  while (stack.length > 0) {
    const x = stack.pop();
    if (typeof x !== 'object' || x === null || Object.isFrozen(x) || ArrayBuffer.isView(x) || x instanceof Map || x instanceof Set) continue;
    Object.freeze(x);
    // arrays by index (Object.keys would build a string per element), and only what can be frozen
    if (Array.isArray(x)) {
      for (let i = 0; i < x.length; i++) {
        const y: unknown = x[i];
        if (typeof y === 'object' && y !== null) stack.push(y);
      }
    } else {
      // values only: a getter (a result computed on first read) is not run by freezing
      const props = Object.getOwnPropertyDescriptors(x);
      for (const k of Object.keys(props)) {
        const y: unknown = (props[k] as PropertyDescriptor).value;
        if (typeof y === 'object' && y !== null) stack.push(y);
      }
    }
  }
  return v;
}
