p='packages/core/src/limits/midpointBalance.ts'
s=open(p).read()
def sub(a,b):
    global s
    assert a in s, a[:70]
    s=s.replace(a,b,1)
sub("""  // events: start (+) and end (−) of each ray piece, in flat arrays (no garbage in the hot loop)
  let cap = 4 * MIDPOINT_SAMPLES;
  let er = new Float64Array(cap);
  let ev = new Float64Array(4 * cap);
  let n = 0;
  const push = (r: number, ls: number, lc: number, hs: number, hc: number) => {
    if (n === cap) {
      cap *= 2;
      const r2 = new Float64Array(cap);
      r2.set(er);
      er = r2;
      const v2 = new Float64Array(4 * cap);
      v2.set(ev);
      ev = v2;
    }
    er[n] = r;
    ev[4 * n] = ls;
    ev[4 * n + 1] = lc;
    ev[4 * n + 2] = hs;
    ev[4 * n + 3] = hc;
    n++;
  };""","""  // events: start (+) and end (−) of each ray piece, in flat arrays (no garbage in the hot loop)
  const events = new RayEvents(4 * MIDPOINT_SAMPLES);
  const push = (r: number, ls: number, lc: number, hs: number, hc: number) => events.push(r, ls, lc, hs, hc);""")
sub("""  const r0s: number[] = [];
  const r1s: number[] = [];""","""  const r0s: number[] = [];
  const r1s: number[] = [];
  const span = new Float64Array(2);""")
sub("""      let r0 = 0;
      let r1 = mTop;
      const o = 9 * t;""","""      const o = 9 * t;""")
sub("""      // d_j(r) = a_j·r + b_j ≥ 0 for the three vertices: the stretch of the ray inside the triangle
      // (written out three times: a closure here would be allocated for every triangle of every ray)
      if (Math.abs(a0) < 1e-15) {
        if (b0 < -1e-12) r1 = -1;
      } else if (a0 > 0) r0 = Math.max(r0, -b0 / a0);
      else r1 = Math.min(r1, -b0 / a0);
      if (Math.abs(a1) < 1e-15) {
        if (b1 < -1e-12) r1 = -1;
      } else if (a1 > 0) r0 = Math.max(r0, -b1 / a1);
      else r1 = Math.min(r1, -b1 / a1);
      if (Math.abs(a2) < 1e-15) {
        if (b2 < -1e-12) r1 = -1;
      } else if (a2 > 0) r0 = Math.max(r0, -b2 / a2);
      else r1 = Math.min(r1, -b2 / a2);
      if (r1 - r0 <= 1e-12) continue;""","""      // d_j(r) = a_j·r + b_j ≥ 0 for the three vertices: the stretch of the ray inside the triangle
      span[0] = 0;
      span[1] = mTop;
      narrowSpan(a0, b0, span);
      narrowSpan(a1, b1, span);
      narrowSpan(a2, b2, span);
      const r0 = span[0] as number;
      const r1 = span[1] as number;
      if (r1 - r0 <= 1e-12) continue;""")
sub("""  const sorted = er.slice(0, n).sort();""","""  const { radii: er, values: ev, count: n } = events;
  const sorted = er.slice(0, n).sort();""")
sub("""/** A diagram prepared for ray sweeps""","""// Narrows the stretch [span[0], span[1]] of a ray to where d(r) = a·r + b ≥ 0 (span[1] = −1: nowhere).
function narrowSpan(a: number, b: number, span: Float64Array): void {
  if (Math.abs(a) < 1e-15) {
    if (b < -1e-12) span[1] = -1;
  } else if (a > 0) span[0] = Math.max(span[0] as number, -b / a);
  else span[1] = Math.min(span[1] as number, -b / a);
}

/** The start and end events of ray pieces: a radius and four coefficients each, in flat arrays that grow by doubling. */
class RayEvents {
  radii: Float64Array;
  values: Float64Array;
  count = 0;

  constructor(capacity: number) {
    this.radii = new Float64Array(capacity);
    this.values = new Float64Array(4 * capacity);
  }

  push(r: number, ls: number, lc: number, hs: number, hc: number): void {
    if (this.count === this.radii.length) {
      const radii = new Float64Array(2 * this.radii.length);
      radii.set(this.radii);
      this.radii = radii;
      const values = new Float64Array(2 * this.values.length);
      values.set(this.values);
      this.values = values;
    }
    const n = this.count++;
    this.radii[n] = r;
    this.values[4 * n] = ls;
    this.values[4 * n + 1] = lc;
    this.values[4 * n + 2] = hs;
    this.values[4 * n + 3] = hc;
  }
}

/** A diagram prepared for ray sweeps""")
open(p,'w').write(s)
