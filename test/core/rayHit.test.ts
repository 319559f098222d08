import { describe, expect, it } from 'vitest';
import { rayHit } from '../../packages/core/src/geometry/rayHit.js';
import { fc, fcParams } from '../support/fc.js';

// The one ray–segment test of the outline geometry and the outline clamp: the crossing it reports
// lies on both the ray (at distance t) and the segment (at parameter s). Line intersection, common
// practice; checked to 1e-9 on seeded segments.
describe('rayHit', () => {
  it('finds a crossing that lies on the ray and on the segment, and says which way it crosses', () => {
    const out = new Float64Array(3);
    expect(rayHit(1, 0, [2, -1], [2, 1], out)).toBe(true);
    expect([...out]).toEqual([2, 0.5, 2]);
    expect(rayHit(1, 0, [2, 1], [2, -1], out)).toBe(true);
    expect(out[2]).toBeLessThan(0);
    expect(rayHit(1, 0, [0, 1], [3, 1], out)).toBe(false);
  });

  it('puts the point at t along the ray and at s along the segment (seeded property)', () => {
    const coord = fc.double({ min: -2, max: 2, noNaN: true });
    fc.assert(
      fc.property(fc.double({ min: 0, max: 2 * Math.PI, noNaN: true }), coord, coord, coord, coord, (th, px, py, qx, qy) => {
        const out = new Float64Array(3);
        const [ux, uy] = [Math.cos(th), Math.sin(th)];
        if (!rayHit(ux, uy, [px, py], [qx, qy], out)) return;
        const [t, s] = [out[0] as number, out[1] as number];
        if (Math.abs(out[2] as number) < 1e-6 || Math.abs(t) > 1e6) return;
        expect(Math.abs(t * ux - (px + s * (qx - px)))).toBeLessThan(1e-9 * Math.max(1, Math.abs(t)));
        expect(Math.abs(t * uy - (py + s * (qy - py)))).toBeLessThan(1e-9 * Math.max(1, Math.abs(t)));
      }),
      fcParams(300),
    );
  });
});
