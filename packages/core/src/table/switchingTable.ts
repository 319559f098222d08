import { HexsalvageInputError } from '../shared/errors.js';
import { requireAtlas } from '../shared/validate.js';
import { CAUTIONS } from '../shared/cautions.js';
import { gatedDeviceIds, legLevels } from '../netlist/expandElements.js';
import { diagramAtlas, type DiagramAtlas } from '../vectors/diagramAtlas.js';
import type { Phase } from '../netlist/faults.js';
import { faultTexts, type AnalyseLegOptions } from '../leg/analyseLeg.js';
import { POLARITY_STRINGS, type PolarityString } from '../leg/polarity.js';
import { polarityDocument, type PlanPolarity } from '../limits/planRemedial.js';
import type { PolarityDiagram } from '../vectors/polarityDiagram.js';
import { patternSteps, type PhaseSteps } from './patternSteps.js';
import { polarityTable, type TableTriangle } from './polarityTable.js';

/** Most levels (DC nodes) a leg may have for the switching table and what is built on it (runtime, exports, simulation, report). */
export const MAX_TABLE_LEVELS = 11;

/** Version of the switching-table document layout. */
export const TABLE_SCHEMA_VERSION = 2;

/** One polarity of the switching table: its diagram plus the per-triangle table. */
export interface TablePolarity extends PlanPolarity {
  /** Index of the polarity in {@link POLARITY_STRINGS} (the C and CSV polarity index). */
  readonly index: number;
  readonly tableTriangles: readonly TableTriangle[];
}

/** A flagged triangle. */
export interface TriangleFlag {
  readonly polarity: PolarityString;
  readonly triangle: number;
  /** What is flagged, e.g. device ids or `P→N`. */
  readonly detail: readonly string[];
}

/** The degraded switching-state table of a faulted leg. */
export interface SwitchingTable {
  readonly schemaVersion: number;
  readonly kind: 'hexsalvage-switching-table';
  readonly topology: string;
  readonly faults: readonly string[];
  /** DC potentials of the leg, ascending (units of Vdc/2). */
  readonly levels: readonly number[];
  /** Pattern names in netlist order (the C pattern index). */
  readonly patterns: readonly string[];
  /** Gated devices of one phase in netlist order: bit i of a gate mask is device i. */
  readonly devices: readonly string[];
  /** Per pattern (same order as `patterns`), the gated devices it switches on. */
  readonly patternGates: readonly (readonly string[])[];
  /** Devices marked `switching: line` (meant to switch at the fundamental frequency). */
  readonly lineDevices: readonly string[];
  /** Per phase: the level of each pattern, the pattern changes allowed in one step, and pattern preference, per polarity character (what the runtime reads). */
  readonly phaseSteps: Readonly<Record<Phase, PhaseSteps>>;
  /** Polarity strings by index. */
  readonly polarityOrder: readonly PolarityString[];
  readonly polarities: Readonly<Record<PolarityString, TablePolarity>>;
  readonly flags: {
    readonly lineDevicesAtPwm: readonly TriangleFlag[];
    readonly levelJumps: readonly TriangleFlag[];
    readonly midpointAuthorityLost: readonly TriangleFlag[];
    /** Triangles for which no switching sequence obeys the sequence rule (never on built-in legs). */
    readonly noSequence: readonly TriangleFlag[];
  };
  readonly cautions: readonly string[];
}

/**
 * Builds the degraded switching-state table for all 25 polarity strings.
 *
 * @param options - topology and faults
 * @returns the table document (plain data)
 * @throws HexsalvageInputError on bad topology or faults
 * @example
 * ```ts
 * const table = switchingTable({ topology: 'anpc-hybrid', faults: ['a.innerUpper'] });
 * table.flags.lineDevicesAtPwm.length; // triangles that drive line-frequency IGBTs at PWM rate
 * ```
 */
export function switchingTable(options: AnalyseLegOptions): SwitchingTable {
  return switchingTableFromAtlas(diagramAtlas(options));
}

/**
 * Builds the switching table from a prepared atlas.
 *
 * @param atlas - from `diagramAtlas`
 * @returns the table document
 * @example
 * ```ts
 * switchingTableFromAtlas(diagramAtlas({ topology: 'npc' })).polarities['+--'].tableTriangles.length; // 24
 * ```
 */
export function switchingTableFromAtlas(atlas: DiagramAtlas): SwitchingTable {
  requireAtlas(atlas, 'switchingTableFromAtlas');
  const count = legLevels(atlas.analysis.leg).length;
  if (count > MAX_TABLE_LEVELS)
    throw new HexsalvageInputError(
      'topology',
      atlas.analysis.topology,
      'dcNodes',
      `a leg of at most ${MAX_TABLE_LEVELS} levels for the switching table, its runtime and exports (a documented limit: the table of ${count} levels would be too large)`,
      count,
    );
  const polarities: Record<PolarityString, TablePolarity> = {};
  const lineDevicesAtPwm: TriangleFlag[] = [];
  const levelJumps: TriangleFlag[] = [];
  const midpointAuthorityLost: TriangleFlag[] = [];
  const noSequence: TriangleFlag[] = [];
  POLARITY_STRINGS.forEach((p, index) => {
    const t = polarityTable(atlas, p);
    polarities[p] = { index, ...polarityDocument(atlas.faulted.get(p) as PolarityDiagram), tableTriangles: t.triangles };
    t.triangles.forEach((tri, i) => {
      const s = tri.sequence;
      if (s && s.lineDevicesSwitching.length > 0) lineDevicesAtPwm.push({ polarity: p, triangle: i, detail: s.lineDevicesSwitching });
      if (s && s.levelJumps.length > 0)
        levelJumps.push({
          polarity: p,
          triangle: i,
          detail: s.levelJumps.map((j: { phase: Phase; from: number; to: number }) => `${j.phase}: ${j.from}→${j.to}`),
        });
      if (!s) noSequence.push({ polarity: p, triangle: i, detail: ['no sequence obeys the sequence rule'] });
      if (tri.authorityLost) midpointAuthorityLost.push({ polarity: p, triangle: i, detail: [`${tri.healthyMidpointAuthority}→${tri.midpointAuthority}`] });
    });
  });
  const leg = atlas.analysis.leg;
  return {
    schemaVersion: TABLE_SCHEMA_VERSION,
    kind: 'hexsalvage-switching-table',
    topology: atlas.analysis.topology,
    faults: faultTexts(atlas.analysis),
    levels: legLevels(leg),
    patterns: Object.keys(leg.patterns),
    devices: gatedDeviceIds(leg),
    patternGates: Object.values(leg.patterns),
    lineDevices: leg.devices.filter((d) => d.switching === 'line').map((d) => d.id),
    phaseSteps: {
      a: patternSteps(atlas.analysis.phases.a, atlas.analysis.healthy, atlas.analysis.rules, legLevels(leg)),
      b: patternSteps(atlas.analysis.phases.b, atlas.analysis.healthy, atlas.analysis.rules, legLevels(leg)),
      c: patternSteps(atlas.analysis.phases.c, atlas.analysis.healthy, atlas.analysis.rules, legLevels(leg)),
    },
    polarityOrder: POLARITY_STRINGS,
    polarities,
    flags: { lineDevicesAtPwm, levelJumps, midpointAuthorityLost, noSequence },
    cautions: CAUTIONS,
  };
}
