import type { LegNetlist } from '@hexsalvage/core';

/**
 * An N-level diode-clamped leg (a test input, like the bench's): N − 1 switches above the output and
 * N − 1 below, each with its antiparallel diode, and clamp diodes from each inner DC node to the
 * chains; pattern L<l> gives level l (0 = lowest).
 *
 * @param n - number of levels (≥ 3)
 * @returns the netlist
 */
export function diodeClampedLeg(n: number): LegNetlist {
  const m = n - 1;
  const dc = Object.fromEntries(Array.from({ length: n }, (_, i) => [`V${i}`, Number((1 - (2 * i) / (n - 1)).toFixed(12))]));
  const names = Object.keys(dc);
  const upper = [names[0], ...Array.from({ length: m - 1 }, (_, i) => `A${i + 1}`), 'out'];
  const lower = ['out', ...Array.from({ length: m - 1 }, (_, i) => `B${i + 1}`), names[n - 1]];
  const devices: LegNetlist['devices'][number][] = [];
  for (let i = 0; i < m; i++) devices.push({ id: `s${i + 1}`, kind: 'igbt', from: upper[i] as string, to: upper[i + 1] as string, antiparallelDiode: true });
  for (let i = 0; i < m; i++)
    devices.push({ id: `s${m + i + 1}`, kind: 'igbt', from: lower[i] as string, to: lower[i + 1] as string, antiparallelDiode: true });
  for (let i = 1; i < m; i++) {
    devices.push({ id: `dA${i}`, kind: 'diode', from: names[i] as string, to: `A${i}` });
    devices.push({ id: `dB${i}`, kind: 'diode', from: `B${i}`, to: names[i] as string });
  }
  const patterns = Object.fromEntries(Array.from({ length: n }, (_, l) => [`L${l}`, Array.from({ length: m }, (_, j) => `s${n - l + j}`)]));
  return { name: `${n}-level diode-clamped (test)`, dcNodes: dc, output: 'out', devices, patterns };
}
