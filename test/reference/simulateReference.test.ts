import { describe, expect, it } from 'vitest';
import { simulatePeriod, simulationWaveform } from '@hexsalvage/core';

// The simulated fundamental period against facts of PWM theory.
const base = { vdc: 700, currentPeak: 100, f1: 50 } as const;

describe('line voltage of one simulated period', () => {
  it('has the fundamental m·(Vdc/2)·√3 of the reference, up to the regular-sampling error that falls as 1/N² (common practice)', () => {
    // Regular-sampled SVM reproduces each switching period's reference average exactly (volt-second
    // balance); the fundamental of that staircase differs from the reference by O((π/N)²).
    const err = (topology: string, fsw: number) => {
      const s = simulatePeriod({ ...base, topology, m: 0.8, loadAngleDeg: 10, fsw, maxHarmonic: 2 });
      return Math.abs(s.lineVoltage.fundamentalPeak / (0.8 * 350 * Math.sqrt(3)) - 1);
    };
    for (const t of ['two-level', 'npc', 'tnpc']) {
      expect(err(t, 5000)).toBeLessThan(2e-4);
      expect(err(t, 50000)).toBeLessThan(2e-6);
      expect(err(t, 5000) / err(t, 50000)).toBeGreaterThan(50);
    }
  });

  it("satisfies Parseval: the harmonics never add up to more than the mean square, and the rest shrinks as more are counted (Parseval's theorem, common practice)", () => {
    const deficit = (maxHarmonic: number) => {
      const s = simulatePeriod({ ...base, topology: 'npc', m: 0.9, loadAngleDeg: 30, fsw: 3000, maxHarmonic });
      const sum = s.lineVoltage.harmonics.reduce((k, [, v]) => k + (v * v) / 2, 0);
      return s.lineVoltage.rms ** 2 - sum; // a line voltage of a balanced set has no DC term
    };
    const [d1, d2, d3] = [deficit(240), deficit(2400), deficit(24000)];
    for (const d of [d1, d2, d3]) expect(d).toBeGreaterThan(-1e-6 * 350 * 350);
    expect(d2).toBeLessThan(d1);
    expect(d3).toBeLessThan(d2);
    // the rest of a piecewise-constant wave falls like 1/H (jumps give |c_n| ~ 1/n)
    expect(d3 / d2).toBeLessThan(0.2);
  });

  it("puts a two-level leg's line-voltage harmonics in sideband groups around multiples of the carrier, the largest at twice the carrier for centred space-vector modulation, and cancels every triplen harmonic, the carrier harmonics included (D. G. Holmes, T. A. Lipo, Pulse Width Modulation for Power Converters, 2003, ch. 3 and 6, from memory)", () => {
    // mf = 51 is a multiple of 3, so the carrier harmonics 51, 102, 153 are zero-sequence: equal in
    // the three phases, they cancel between two of them. Centred SVM (equal zero-vector split)
    // moves most of the first carrier group into the second: the two largest sit at 2·mf ± 1.
    const s = simulatePeriod({ ...base, topology: 'two-level', m: 0.8, loadAngleDeg: 0, fsw: 2550 });
    const mf = s.periods;
    expect(mf).toBe(51);
    const v1 = s.lineVoltage.fundamentalPeak;
    const top = [...s.lineVoltage.harmonics]
      .filter(([n]) => n > 10)
      .sort((a, b) => b[1] - a[1])
      .slice(0, 8)
      .map(([n]) => n);
    for (const n of top) expect(Math.abs(n - mf * Math.round(n / mf))).toBeLessThanOrEqual(4);
    expect(top.slice(0, 2).sort()).toEqual([2 * mf - 1, 2 * mf + 1]);
    for (const [n, v] of s.lineVoltage.harmonics) if (n % 3 === 0) expect(v).toBeLessThan(1e-9 * v1);
  });
});

describe('device currents', () => {
  it('a healthy NPC phase at unity power factor is clamped to the midpoint mostly around the zero crossings of its voltage (B. Wu, High-Power Converters and AC Drives, 2006, ch. 8, from memory)', () => {
    for (const m of [0.9, 1.1]) {
      const seg = simulationWaveform({ ...base, topology: 'npc', m, loadAngleDeg: 0, fsw: 6000 });
      const w = 2 * Math.PI * base.f1;
      let nearPeak = 0;
      let peakTime = 0;
      let nearZero = 0;
      let zeroTime = 0;
      for (const g of seg) {
        const th = ((((w * (g.t0 + g.t1)) / 2) * 180) / Math.PI) % 180;
        const clamped = g.paths[0].some((id) => id.startsWith('clamp')) ? g.t1 - g.t0 : 0;
        if (th < 20 || th > 160) {
          nearPeak += clamped;
          peakTime += g.t1 - g.t0;
        }
        if (th > 70 && th < 110) {
          nearZero += clamped;
          zeroTime += g.t1 - g.t0;
        }
      }
      expect(nearZero / zeroTime).toBeGreaterThan(2 * (nearPeak / peakTime));
    }
  });
});
