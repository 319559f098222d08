import { describe, expect, it } from 'vitest';
import { BoundedCache } from '../../packages/core/src/shared/boundedCache.js';

describe('BoundedCache', () => {
  it('through makes a value once per key, stores it frozen and hands back the stored one', () => {
    const cache = new BoundedCache<{ list: number[] }>(4);
    let made = 0;
    const make = () => {
      made++;
      return { list: [1, 2] };
    };
    const a = cache.through('k', make);
    const b = cache.through('k', make);
    expect(made).toBe(1);
    expect(b).toBe(a);
    expect(Object.isFrozen(a) && Object.isFrozen(a.list)).toBe(true);
  });

  it('forgets the least recently used key beyond its limit (a key asked for again is made again)', () => {
    const cache = new BoundedCache<number>(2);
    let made = 0;
    const make = () => ++made;
    cache.through('a', make);
    cache.through('b', make);
    cache.through('a', make); // a is now the most recently used
    cache.through('c', make); // evicts b
    expect(cache.size).toBe(2);
    expect(cache.get('b')).toBeUndefined();
    expect(cache.through('a', make)).toBe(1);
    expect(made).toBe(3);
  });
});
