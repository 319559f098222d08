import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import { XMLParser, XMLValidator } from 'fast-xml-parser';
import { describe, expect, it } from 'vitest';
import { builtinLeg, deratingCurve, faultAtlas, samplePeriod, simulatePeriod, simulationWaveform, parseNetlist, planRemedial } from '@hexsalvage/core';
import { diagramAtlas, gatedDeviceIds, planFromAtlas, switchingTableFromAtlas } from '@hexsalvage/core/internal';
import {
  atlasHeatmapSvg,
  atlasPairMatrixSvg,
  deratingCurveSvg,
  legSchematicSvg,
  lossBarsSvg,
  ratioColour,
  spectrumSvg,
  waveformsSvg,
  sectorOverviewSvg,
  switchingPeriodSvg,
  vectorDiagramSvg,
} from '@hexsalvage/plot';

// Golden files: regenerate with UPDATE_GOLDEN=1 pnpm test (then review the diff like code).
function golden(name: string, svg: string): void {
  const url = new URL(`./golden/${name}.svg`, import.meta.url);
  if (process.env.UPDATE_GOLDEN === '1') writeFileSync(url, svg);
  if (!existsSync(url)) throw new Error(`golden file ${name}.svg missing: run UPDATE_GOLDEN=1 pnpm test and review it`);
  expect(svg).toBe(readFileSync(url, 'utf8'));
}

const parser = new XMLParser({
  ignoreAttributes: false,
  attributeNamePrefix: '@',
  isArray: (_name: string, _path: unknown, _leaf: boolean, isAttribute: boolean) => !isAttribute,
});
// every element with a given class, anywhere in the tree
function byClass(svg: string, cls: string): unknown[] {
  const found: unknown[] = [];
  const walk = (node: unknown) => {
    if (Array.isArray(node)) return node.forEach(walk);
    if (node && typeof node === 'object') {
      const o = node as Record<string, unknown>;
      const c = o['@class'];
      if (typeof c === 'string' && c.split(' ').includes(cls)) found.push(o);
      for (const [k, v] of Object.entries(o)) if (!k.startsWith('@')) walk(v);
    }
  };
  walk(parser.parse(svg));
  return found;
}
function wellFormed(svg: string): void {
  // fast-xml-parser (npm) as an independent XML well-formedness check
  expect(XMLValidator.validate(svg)).toBe(true);
  expect(svg).toMatch(/<title id="hs[0-9a-f]{8}-t">/);
  expect(svg).toMatch(/<desc id="hs[0-9a-f]{8}-d">/);
}

const atlas = diagramAtlas({ topology: 'npc', faults: ['a.outerUpper.diode'] });
const plan = planFromAtlas(atlas, 30, 0);

describe('vectorDiagramSvg', () => {
  it('draws one marker per surviving and per lost vector and one path per triangle', () => {
    for (const pol of ['--+', '+--', '?-+']) {
      const svg = vectorDiagramSvg(plan, pol, { referenceM: 0.5 });
      wellFormed(svg);
      const d = plan.polarities[pol]!;
      expect(byClass(svg, 'surviving')).toHaveLength(d.vectors.length);
      expect(byClass(svg, 'lost')).toHaveLength(d.lost.length);
      expect(byClass(svg, 'lost-label')).toHaveLength(d.lost.length); // a text mark, not colour alone
      expect(byClass(svg, 'triangle')).toHaveLength(d.triangles.length);
      expect(byClass(svg, 'hull')).toHaveLength(1);
      expect(byClass(svg, 'reference')).toHaveLength(1);
    }
    expect(byClass(vectorDiagramSvg(plan, '--+'), 'binding-edge')).toHaveLength(1);
  });
  it('matches its golden file', () => golden('diagram-npc-outerUpperDiode-30', vectorDiagramSvg(plan, '--+', { referenceM: 0.6 })));
});

describe('sectorOverviewSvg', () => {
  it('draws one diagram per sector and marks the binding one', () => {
    const svg = sectorOverviewSvg(plan);
    wellFormed(svg);
    expect(byClass(svg, 'sector')).toHaveLength(plan.sectors.length);
    expect(byClass(svg, 'theta-arc')).toHaveLength(plan.sectors.length);
    expect(byClass(svg, 'binding')).toHaveLength(1);
  });
  it('matches its golden file', () => golden('sectors-npc-outerUpperDiode-30', sectorOverviewSvg(plan)));
});

describe('deratingCurveSvg', () => {
  const a = deratingCurve(atlas, { stepDeg: 5 });
  const b = deratingCurve(diagramAtlas({ topology: 'npc', faults: ['a.outerUpper'] }), { stepDeg: 5 });
  it('draws one path per fault case and a marker per breakpoint', () => {
    const svg = deratingCurveSvg([
      { label: 'a.outerUpper.diode', points: a },
      { label: 'a.outerUpper', points: b },
    ]);
    wellFormed(svg);
    expect(byClass(svg, 'series')).toHaveLength(2);
    expect(byClass(svg, 'breakpoint')).toHaveLength([...a, ...b].filter((p) => p.breakpoint).length);
    expect(byClass(svg, 'healthy')).toHaveLength(1);
    expect(byClass(svg, 'tick').length).toBeGreaterThan(10);
  });
  it('matches its golden file', () => golden('derating-npc', deratingCurveSvg([{ label: 'a.outerUpper.diode', points: a }])));
});

describe('legSchematicSvg', () => {
  it('draws every device of a built-in leg and of a netlist file, marking the failed one', () => {
    const five = parseNetlist(JSON.parse(readFileSync(new URL('../../examples/five-level-leg.json', import.meta.url), 'utf8')), 'five');
    for (const leg of [builtinLeg('anpc'), builtinLeg('tnpc'), five]) {
      const svg = legSchematicSvg(leg, { failed: [leg.devices[0]!.id] });
      wellFormed(svg);
      expect(byClass(svg, 'device')).toHaveLength(leg.devices.length);
      expect(byClass(svg, 'failed-mark')).toHaveLength(1);
      expect(byClass(svg, 'dc-node')).toHaveLength(Object.keys(leg.dcNodes).length);
    }
  });
  it('highlights the conduction path and writes out an interrupted one', () => {
    const leg = builtinLeg('npc');
    const lit = legSchematicSvg(leg, { pattern: { name: 'P', gates: ['outerUpper', 'innerUpper'] }, sign: '+', path: ['outerUpper', 'innerUpper'], level: 1 });
    expect(byClass(lit, 'conduction')).toHaveLength(2);
    const cut = legSchematicSvg(leg, {
      failed: ['outerUpper.diode'],
      pattern: { name: 'P', gates: ['outerUpper', 'innerUpper'] },
      sign: '-',
      path: [],
      level: null,
    });
    expect(byClass(cut, 'interrupted')).toHaveLength(1);
    expect(cut).toContain('current interrupted');
  });
  it('matches its golden file', () =>
    golden(
      'leg-anpc-clampUpper',
      legSchematicSvg(builtinLeg('anpc'), {
        failed: ['clampUpper'],
        pattern: { name: 'O-upper', gates: ['clampUpper', 'innerUpper'] },
        sign: '-',
        path: ['outerUpper.diode', 'innerUpper.diode'],
        level: 1,
      }),
    ));
});

describe('switchingPeriodSvg', () => {
  const table = switchingTableFromAtlas(diagramAtlas({ topology: 'anpc-hybrid', faults: ['a.innerUpper'] }));
  const switches = gatedDeviceIds(builtinLeg('anpc-hybrid'));
  // the runtime's period at the centroid of triangle 7 of +--, with the currents of a 25° load angle there
  const tri = table.polarities['+--']!.tableTriangles[7]!;
  const [alpha, beta] = [
    (tri.vertices[0].alpha + tri.vertices[1].alpha + tri.vertices[2].alpha) / 3,
    (tri.vertices[0].beta + tri.vertices[1].beta + tri.vertices[2].beta) / 3,
  ];
  const th = Math.atan2(beta, alpha);
  const currents = [0, 1, 2].map((k) => Math.cos(th - (25 * Math.PI) / 180 - (k * 2 * Math.PI) / 3)) as [number, number, number];
  const period = samplePeriod(table, { alpha, beta, polarity: '+--', currents });
  it("draws a level trace per phase and gate rows whose changes add up to the period's gate changes", () => {
    const svg = switchingPeriodSvg(period, { switches, levels: table.levels, lineDevices: table.lineDevices });
    wellFormed(svg);
    expect(byClass(svg, 'level-trace')).toHaveLength(3);
    const counts = [...svg.matchAll(/>(\d+) ch\.</g)].map((m) => Number(m[1]));
    expect(counts).toHaveLength(3 * switches.length);
    // every gate change between consecutive states, counted independently here
    let expected = 0;
    for (let i = 0; i + 1 < period.states.length; i++)
      for (let k = 0; k < 3; k++) {
        const a = period.states[i]!.gates[k]!;
        const b = period.states[i + 1]!.gates[k]!;
        expected += a.filter((g) => !b.includes(g)).length + b.filter((g) => !a.includes(g)).length;
      }
    expect(counts.reduce((x, y) => x + y, 0)).toBe(expected);
    expect(expected).toBeGreaterThan(0);
    // a period begins and ends in the same state
    expect(period.states[0]!.patterns).toEqual(period.states[period.states.length - 1]!.patterns);
  });
  it('matches its golden file', () =>
    golden('sequence-anpcHybrid-innerUpper', switchingPeriodSvg(period, { switches, levels: table.levels, lineDevices: table.lineDevices })));
});

describe('plots are byte-stable', () => {
  it('gives identical SVG for identical input', () => {
    const p2 = planRemedial({ topology: 'npc', faults: ['a.outerUpper.diode'], loadAngleDeg: 30 });
    expect(vectorDiagramSvg(p2, '--+')).toBe(vectorDiagramSvg(plan, '--+'));
    expect(sectorOverviewSvg(p2)).toBe(sectorOverviewSvg(plan));
  });
});

describe('atlasHeatmapSvg and atlasPairMatrixSvg', () => {
  const single = faultAtlas({ topology: 'npc', loadAngleRangeDeg: [-60, 60], stepDeg: 15 });
  it('draws one cell per fault and load angle, a × exactly where the leg cannot run, and a colour bar', () => {
    const svg = atlasHeatmapSvg(single);
    wellFormed(svg);
    expect(byClass(svg, 'cell')).toHaveLength(single.entries.length * 9);
    const cannot = single.entries.reduce((k, e) => k + e.mMaxAt.filter(([, m]) => m <= 1e-9).length, 0);
    expect(cannot).toBeGreaterThan(0);
    expect(byClass(svg, 'cannot-run')).toHaveLength(cannot);
    expect(byClass(svg, 'colour-bar')).toHaveLength(1);
    expect(svg).toContain('load angle φ (degrees');
  });
  it('colours on a scale that gets lighter as the ratio grows (readable in grey print)', () => {
    // relative luminance, WCAG 2.1 (W3C, 2018), definition of relative luminance
    const lum = (c: string) => {
      const [r, g, b] = [1, 3, 5].map((k) => parseInt(c.slice(k, k + 2), 16) / 255).map((v) => (v <= 0.04045 ? v / 12.92 : ((v + 0.055) / 1.055) ** 2.4));
      return 0.2126 * r! + 0.7152 * g! + 0.0722 * b!;
    };
    for (let k = 1; k <= 100; k++) expect(lum(ratioColour(k / 100))).toBeGreaterThan(lum(ratioColour((k - 1) / 100)));
    expect(ratioColour(-1)).toBe(ratioColour(0));
    expect(ratioColour(2)).toBe(ratioColour(1));
  });
  it('draws the pair matrix with every pair twice (symmetric), same-device cells grey', () => {
    const pairs = faultAtlas({ topology: 'two-level', pairs: true, modes: ['open'], stepDeg: 30 });
    const svg = atlasPairMatrixSvg(pairs);
    wellFormed(svg);
    const n = 3 * 4; // open faults of three phases, two switches and two diodes each
    expect(pairs.entries).toHaveLength((n * (n - 1)) / 2);
    expect(byClass(svg, 'cell')).toHaveLength(2 * pairs.entries.length);
    expect(byClass(svg, 'not-a-pair')).toHaveLength(n);
  });
  it('matches its golden file', () => golden('atlas-npc-open', atlasHeatmapSvg(faultAtlas({ topology: 'npc', modes: ['open'], stepDeg: 30 }))));
});

describe('simulation plots', () => {
  const options = { topology: 'npc', faults: ['a.outerUpper'], m: 0.5, loadAngleDeg: 20, polarityMarginDeg: 5, vdc: 750, currentPeak: 150, f1: 50, fsw: 3000 };
  const sim = simulatePeriod(options);
  it('draws paired loss bars for every element with a loss, healthy and faulted', () => {
    const svg = lossBarsSvg(sim);
    wellFormed(svg);
    const lossy = Object.keys(sim.devices).filter(
      (id) =>
        sim.devices[id]!.conductionLoss + sim.devices[id]!.switchingLoss > 1e-6 ||
        sim.healthy.devices[id]!.conductionLoss + sim.healthy.devices[id]!.switchingLoss > 1e-6,
    );
    expect(byClass(svg, 'faulted')).toHaveLength(2 * lossy.length);
    expect(byClass(svg, 'healthy')).toHaveLength(2 * lossy.length);
    expect(svg).toContain('loss over one fundamental period (W)');
  });
  it('draws the spectrum on a linear or a log axis, and one period of voltage and currents', () => {
    for (const log of [false, true]) {
      const svg = spectrumSvg(sim, { log });
      wellFormed(svg);
      expect(svg).toContain(log ? '0.01 %' : '100 %');
      expect(svg).toContain('harmonic order n');
    }
    const w = waveformsSvg(sim, simulationWaveform(options));
    wellFormed(w);
    expect(byClass(w, 'current')).toHaveLength(2);
    expect(byClass(w, 'line-voltage')).toHaveLength(1);
    expect(w).toContain('time (ms)');
  });
});
