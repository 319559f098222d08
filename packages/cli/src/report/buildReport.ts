import {
  CAUTIONS,
  deratingCurve,
  describeRules,
  lineRmsVolts,
  modulationOfLineRms,
  unsafeRules,
  phasePeakVolts,
  PHASES,
  samplePeriod,
  type SequenceMode,
  type ClaimVerdict,
  type DiagramAtlas,
  type FaultAtlas,
  type PatternResult,
  type Simulation,
  type WaveformSegment,
  type PhasePolarity,
  type RemedialPlan,
  type Remedy,
  type Switchover,
  type SwitchingTable,
} from '@hexsalvage/core';
import { limitOverLoadAngles, gatedDeviceIds } from '@hexsalvage/core/internal';
import {
  atlasHeatmapSvg,
  atlasPairMatrixSvg,
  deratingCurveSvg,
  esc,
  lossBarsSvg,
  spectrumSvg,
  waveformsSvg,
  legSchematicSvg,
  sectorOverviewSvg,
  switchingPeriodSvg,
  vectorDiagramSvg,
} from '@hexsalvage/plot';
import { claimRulesText, fmt, levelText, tripletText } from '../format.js';
import type { Scenario } from '../inputs/readScenario.js';
import { schematicFocus } from '../schematicFocus.js';
import { REPORT_CSS } from './reportStyles.js';

/** Inputs of {@link buildReport}. */
export interface ReportInputs {
  readonly atlas: DiagramAtlas;
  readonly plan: RemedialPlan;
  readonly table: SwitchingTable;
  /** The runtime's settings (the switching period drawn, the simulation). Default: continuous, balance on. */
  readonly runtime?: { readonly sequence: SequenceMode; readonly balance: 'on' | 'off' };
  /** The `--topology` value as the user gave it. */
  readonly topologyText: string;
  readonly verdicts?: readonly ClaimVerdict[];
  /** Every fault of the leg (`report --atlas`): an appendix. */
  readonly faultAtlas?: FaultAtlas;
  /** Tool and version, shown in the header. */
  readonly generatedBy: string;
  /** The review scenario the report was made for (`report --scenario`). */
  readonly scenario?: ReportScenario;
  /** Total DC-link voltage in volts (the scenario's, or `--vdc`): volts beside the per-unit figures. */
  readonly vdc?: number;
  /** The command line that made the report, as typed. */
  readonly commandLine?: string;
  /** When it was made, ISO 8601 UTC (from SOURCE_DATE_EPOCH when set, for byte-reproducible builds). */
  readonly date?: string;
  /** Every input file with its SHA-256. */
  readonly inputs?: readonly { readonly path: string; readonly sha256: string }[];
  /** One simulated period at the operating point (the scenario's drive data), with its waveform. */
  readonly simulation?: { readonly sim: Simulation; readonly segments: readonly WaveformSegment[] };
  /** What could be done about the fault, best first (`planRemedies`). */
  readonly remedies?: readonly Remedy[];
  /** From the fault to the degraded table (`switchover`). */
  readonly switchover?: Switchover;
}

/** Scenario data shown in the report header (a scenario file, docs/schema/scenario.schema.json). */
export type ReportScenario = Pick<
  Scenario,
  'drive' | 'ratedPowerKw' | 'ratedLineVoltageV' | 'vdc' | 'fundamentalHz' | 'switchingHz' | 'dcLinkCapacitanceF' | 'loadAngleRangeDeg'
>;

/**
 * The design-review report: one self-contained HTML file (inline CSS and SVG, no scripts, no
 * external requests) that prints on A4.
 *
 * @param r - atlas, plan, table and optional claim verdicts
 * @returns the HTML document
 * @example
 * ```ts
 * writeFileSync('review.html', buildReport({ atlas, plan, table, topologyText: 'npc', generatedBy: 'hexsalvage 0.1.0' }));
 * ```
 */
export function buildReport(r: ReportInputs): string {
  const { atlas, plan, table } = r;
  const leg = atlas.analysis.leg;
  const faultText = plan.faults.join(', ') || 'none (healthy leg)';
  const vdc = r.vdc ?? r.scenario?.vdc;
  const volts = (m: number) =>
    vdc === undefined ? '' : ` = ${fmt(lineRmsVolts(m, vdc), 1)} V line-to-line RMS (${fmt(phasePeakVolts(m, vdc), 1)} V phase peak)`;
  const s: string[] = [];
  s.push(`<h1>Remedial operation review: ${esc(r.scenario?.drive ?? plan.topology)}</h1>`);
  s.push(
    `<p class="muted">Leg ${esc(plan.topology)} · faults: <strong>${esc(faultText)}</strong> · load angle ${fmt(plan.loadAngleDeg, 1)}° · polarity margin ${fmt(plan.polarityMarginDeg, 1)}° · ${esc(r.generatedBy)}</p>`,
  );
  const unsafe = unsafeRules(plan.rules);
  if (plan.stop)
    s.push(
      `<p class="verdict-fails"><strong>Verdict: the drive cannot run in this state${plan.stop.everyLoadAngle ? ', at any load angle' : ' at this load angle'}.</strong> It must stop until repaired; no output voltage can be produced${unsafe ? '' : ' safely'}. Why: ${esc(plan.stop.reason)}</p>`,
    );
  if (unsafe)
    s.push(
      `<p class="verdict-fails"><strong>These figures are NOT a safe operating limit</strong>: ${esc(unsafe)}. For review only; never run a converter at them.</p>`,
    );
  s.push(`<div class="caution" role="note"><strong>Caution.</strong><ul>${CAUTIONS.map((c) => `<li>${esc(c)}</li>`).join('')}</ul></div>`);
  s.push(reviewHeader(r, vdc));
  s.push('<h2>1. Inputs and assumptions</h2>');
  s.push(
    `<table><tr><th>leg</th><td>${esc(leg.name)} (from <code>${esc(r.topologyText)}</code>), ${leg.devices.length} devices, DC nodes ${Object.entries(
      leg.dcNodes,
    )
      .map(([k, v]) => `${esc(k)} = ${fmt(v, 2)}`)
      .join(', ')} (units of Vdc/2)</td></tr>` +
      `<tr><th>faults</th><td>${esc(faultText)}</td></tr>` +
      `<tr><th>operating point</th><td>load angle φ = ${fmt(plan.loadAngleDeg, 2)}° (currents lag the voltage reference); polarity margin δ = ${fmt(plan.polarityMarginDeg, 2)}° (within δ of a current zero crossing the sign counts as unknown)</td></tr>` +
      `<tr><th>rules applied</th><td>${esc(describeRules(plan.rules))}${plan.unrated.length ? `; <span class="flag">unrated devices, not checked: ${esc(plan.unrated.join(', '))}</span>` : ''}</td></tr>` +
      '<tr><th>model</th><td>ideal switches and diodes; an open fault removes all conduction of the element, a short makes it conduct both ways; levels from the highest (i &gt; 0) or lowest (i &lt; 0) reachable DC node; a state is used only if a static distribution of node voltages keeps every rated device within its rating; a phase changes level only by switch actions, one at a time, that pass through such states; no dead time, switching transients or thermal effects</td></tr>' +
      `<tr><th>units</th><td>potentials and modulation index m in units of Vdc/2 (m = peak fundamental phase voltage / (Vdc/2)); healthy linear limit 2/√3 ≈ 1.1547${vdc === undefined ? '' : `; at Vdc = ${fmt(vdc, 1)} V one unit is ${fmt(vdc / 2, 1)} V, and m corresponds to m·${fmt(vdc / 2, 1)} V phase peak, m·${fmt(lineRmsVolts(1, vdc), 1)} V line-to-line RMS`}</td></tr></table>`,
  );

  s.push('<h2>2. Limit and derating</h2>');
  if (plan.stop)
    s.push(
      `<p class="verdict-fails"><strong>The drive cannot run in this state</strong>${plan.stop.everyLoadAngle ? ' at any load angle (every polarity of the cycle occurs at every load angle)' : ' at this load angle'}: no output voltage above 0 can be produced without overstressing a device or breaking a current.</p>`,
    );
  const hullDiffers = Math.abs(plan.mMaxHull - plan.mMax) > 1e-9;
  s.push(
    `<table><tr><th>maximum modulation index, faulted (${unsafe ? 'NOT safe' : 'safe'})</th><td><strong>${fmt(plan.mMax, 6)}</strong>${esc(volts(plan.mMax))}</td></tr><tr><th>healthy</th><td>${fmt(plan.mMaxHealthy, 6)}${esc(volts(plan.mMaxHealthy))}</td></tr><tr><th>derating ratio</th><td><strong>${fmt(plan.deratingRatio * 100, 2)} %</strong></td></tr>` +
      `<tr><th>convex-hull bound (first version)</th><td>${fmt(plan.mMaxHull, 6)}${hullDiffers ? ' <span class="flag">not safe: it ignores what the rules below take away</span>' : ''}</td></tr>` +
      `<tr><th>midpoint balance holds up to</th><td>m = ${fmt(plan.mMaxBalanced, 6)}${esc(volts(plan.mMaxBalanced))}${plan.mMaxBalanced < plan.mMax - 1e-9 ? ' <span class="flag">above this the average midpoint current cannot be held at zero</span>' : ''}</td></tr></table>`,
  );
  s.push(`<p>${esc(bindingExplanation(plan))}</p>`);
  const rated = ratedVoltageText(atlas, plan, r.scenario, vdc);
  if (rated) s.push(`<p class="rated">${esc(rated)}</p>`);
  if (plan.restrictions.length) s.push(`<p>What the rules take away:</p><ul>${plan.restrictions.map((x) => `<li>${esc(x)}</li>`).join('')}</ul>`);
  if (plan.notes.length) s.push(`<ul>${plan.notes.map((x) => `<li class="flag">${esc(x)}</li>`).join('')}</ul>`);
  if (r.remedies?.length) s.push(remediesSection(r.remedies, plan, volts));

  s.push('<h2>3. What each phase leg can still do</h2>');
  for (const ph of PHASES) {
    const t = atlas.analysis.phases[ph];
    if (t === atlas.analysis.healthy) continue;
    s.push(`<h3>Phase ${ph}</h3><table><tr><th>pattern</th><th>gates on</th><th>i &gt; 0</th><th>i &lt; 0</th></tr>`);
    t.patterns.forEach((p, i) => {
      const h = atlas.analysis.healthy.patterns[i] as PatternResult;
      const cell = (sg: '+' | '-') => {
        if (p.status !== 'allowed') return '<span class="flag">forbidden</span>';
        const l = p.bySign[sg].level;
        const was = h.status === 'allowed' ? h.bySign[sg].level : null;
        const why = p.unsafe[sg];
        const txt =
          l === null
            ? why
              ? `<span class="flag">unsafe: ${esc(why)}</span>`
              : '<span class="flag">interrupted (forbidden)</span>'
            : levelText(l, plan.dcLevels);
        return l === was ? txt : `${txt} <span class="flag">(was ${levelText(was, plan.dcLevels)})</span>`;
      };
      s.push(`<tr><td>${esc(p.name)}</td><td>${esc(p.gates.join(', '))}</td><td>${cell('+')}</td><td>${cell('-')}</td></tr>`);
    });
    s.push('</table>');
    s.push(
      `<p>Level sets — i &gt; 0: ${t.levels['+'].map((l) => levelText(l, plan.dcLevels)).join(' ') || 'none'}; i &lt; 0: ${t.levels['-'].map((l) => levelText(l, plan.dcLevels)).join(' ') || 'none'}; unknown sign: ${t.levels['?'].map((l) => levelText(l, plan.dcLevels)).join(' ') || 'none'}.</p>`,
    );
    const mv = (sg: PhasePolarity) =>
      t.commutations.moves[sg]
        .filter(([a, b]) => a < b)
        .map(([a, b]) => `${levelText(a, plan.dcLevels)}↔${levelText(b, plan.dcLevels)}`)
        .join(' ') || 'none (the phase cannot change level)';
    s.push(`<p>Safe level changes — i &gt; 0: ${mv('+')}; i &lt; 0: ${mv('-')}; unknown sign: ${mv('?')}.</p>`);
  }
  if (PHASES.every((ph) => atlas.analysis.phases[ph] === atlas.analysis.healthy)) s.push('<p>No phase is faulted.</p>');

  const focus = schematicFocus(atlas.analysis);
  s.push(
    figure(
      legSchematicSvg(leg, focus),
      `Leg drawn from the netlist. The failed element is crossed out; the thick path is where the current flows for pattern ${focus.pattern?.name ?? '—'} with ${focus.sign === '-' ? 'i < 0' : 'i > 0'}.`,
    ),
  );

  s.push('<h2>4. Vectors and polarity sectors</h2>');
  s.push(
    figure(
      vectorDiagramSvg(plan, plan.limitingPolarity, vdc !== undefined ? { vdc } : {}),
      `Vector diagram of the polarity ${plan.limitingPolarity} in force where the limit binds. Filled dots survive, hollow squares marked × are lost; the grey triangles are the admissible ones a switching sequence can run; the thick red edge is where the limit binds; the green circle is mMax.`,
    ),
  );
  s.push(
    figure(
      sectorOverviewSvg(plan),
      'One diagram per polarity sector over the fundamental cycle; the arc shows the sector’s range of θ, the framed sector sets the limit.',
    ),
  );

  s.push('<h2>5. Derating versus load angle</h2>');
  const curve = deratingCurve(atlas, { polarityMarginDeg: plan.polarityMarginDeg });
  s.push(
    figure(
      deratingCurveSvg([{ label: faultText, points: curve }], {
        healthy: plan.mMaxHealthy,
        title: 'Maximum modulation index versus load angle',
        operatingDeg: plan.loadAngleDeg,
        ...(r.scenario?.loadAngleRangeDeg ? { bandDeg: r.scenario.loadAngleRangeDeg } : {}),
        ...(vdc !== undefined ? { vdc } : {}),
      }),
      `Safe mMax from −90° to 90° (exact at every point, breakpoints circled); worst ${fmt(Math.min(...curve.map((p) => p.mMax)), 4)}, best ${fmt(Math.max(...curve.map((p) => p.mMax)), 4)}. Where drawn, the thin dotted line is the first version's convex-hull bound, which the hardware would not survive.`,
    ),
  );

  s.push('<h2>6. Degraded switching-state table</h2>');
  const f = table.flags;
  const triangleCount = Object.values(table.polarities).reduce((n, p) => n + p.tableTriangles.length, 0);
  s.push(
    plan.stop
      ? `<p class="verdict-fails">Nothing to run: the table below is for diagnosis only (what survives per polarity). Do not export it to firmware; the drive must stop.</p>`
      : `<p>${Object.keys(table.polarities).length} polarity strings, ${triangleCount} triangles in all. Export with <code>hexsalvage export --format json|csv|c</code>${unsafe ? ' — not under these rules: they are NOT safe' : ''}.</p>`,
  );
  s.push(
    `<table><tr><th>flag</th><th>triangles</th><th>examples</th></tr>` +
      flagRow('line-frequency devices driven at PWM rate', f.lineDevicesAtPwm) +
      flagRow('midpoint (neutral-point) control lost', f.midpointAuthorityLost) +
      flagRow('phase jumps between non-adjacent levels', f.levelJumps) +
      flagRow('no sequence obeys the sequence rule', f.noSequence) +
      '</table>',
  );
  s.push(
    '<table><thead><tr><th>polarity</th><th>vectors</th><th>lost</th><th>triangles</th><th>reach</th><th>midpoint authority full / partial / none</th></tr></thead><tbody>',
  );
  for (const pol of table.polarityOrder) {
    const p = table.polarities[pol]!;
    const count = (a: string) => p.tableTriangles.filter((t) => t.midpointAuthority === a).length;
    s.push(
      `<tr><td><code>${esc(pol)}</code></td><td>${p.vectors.length}</td><td>${p.lost.length}</td><td>${p.tableTriangles.length}</td><td>${fmt(p.reach, 4)}</td><td>${count('full')} / ${count('partial')} / ${count('none')}</td></tr>`,
    );
  }
  s.push('</tbody></table>');
  if (plan.mMax > 0) {
    // the period the runtime applies at 0.7·mMax where the limit binds, with the currents there
    const th = (plan.limitingAngleDeg * Math.PI) / 180;
    const phi = (plan.loadAngleDeg * Math.PI) / 180;
    const currents = [0, 1, 2].map((k) => Math.cos(th - phi - (k * 2 * Math.PI) / 3)) as [number, number, number];
    const period = samplePeriod(table, {
      alpha: 0.7 * plan.mMax * Math.cos(th),
      beta: 0.7 * plan.mMax * Math.sin(th),
      polarity: plan.limitingPolarity,
      currents,
      ...(r.runtime ?? {}),
    });
    if (period.triangle >= 0) {
      const how = `${r.runtime?.sequence ?? 'continuous'} sequence, midpoint balance ${r.runtime?.balance ?? 'on'}`;
      s.push(
        figure(
          switchingPeriodSvg(period, {
            switches: gatedDeviceIds(leg),
            levels: table.levels,
            lineDevices: table.lineDevices,
            title: `Switching period, polarity ${plan.limitingPolarity}, triangle ${period.triangle}`,
          }),
          `One switching period as the runtime applies it (${how}) at 0.7·mMax in the direction where the limit binds: phase levels and gate signals, gate changes counted per device.`,
        ),
      );
    }
  }

  if (r.switchover) s.push(switchoverSection(r.switchover));
  if (r.verdicts && r.verdicts.length) {
    s.push(
      '<h2>8. Derating claims</h2><table class="claims"><colgroup><col style="width:16%"><col style="width:13%"><col style="width:13%"><col style="width:9%"><col style="width:13%"><col style="width:9%"><col style="width:11%"><col style="width:7%"><col style="width:9%"></colgroup><thead><tr><th>claim</th><th>case</th><th>promised</th><th>load angles</th><th>rules</th><th>verdict</th><th>worst mMax</th><th>at</th><th>short by</th></tr></thead>',
    );
    for (const v of r.verdicts) {
      const other = v.topology !== plan.topology || [...v.faults].sort().join(',') !== [...plan.faults].sort().join(',');
      const rules = `${claimRulesText(v)}, margin ${fmt(v.polarityMarginDeg, 1)}°`;
      const promised = `m ${fmt(v.m, 4)}${v.volts ? ` (${fmt(v.volts.lineRmsPromised, 1)} V rms at Vdc ${fmt(v.volts.vdc, 0)} V)` : ''}`;
      const worst =
        v.mMaxAtWorst === 0 ? '0: cannot run in this state' : `${fmt(v.mMaxAtWorst, 6)}${v.volts ? ` (${fmt(v.volts.lineRmsAtWorst, 1)} V rms)` : ''}`;
      const short = v.holds ? '—' : `${fmt(v.shortfall, 6)}${v.volts ? ` (${fmt(v.volts.shortfallLineRms, 1)} V rms)` : ''}`;
      s.push(
        `<tr><td>${esc(v.name)}</td><td>${esc(v.topology)}: ${esc(v.faults.join(', ') || 'healthy')}${other ? ' <span class="flag">(another case than this report\'s)</span>' : ''}</td><td>${esc(promised)}</td><td>${fmt(v.loadAngleDeg[0], 1)}° … ${fmt(v.loadAngleDeg[1], 1)}°</td><td>${esc(rules)}</td><td class="${v.holds ? 'verdict-holds' : 'verdict-fails'}">${v.holds ? 'holds' : 'FAILS'}</td><td>${esc(worst)}</td><td>${fmt(v.worstLoadAngleDeg, 1)}°</td><td>${esc(short)}</td></tr>`,
      );
    }
    s.push(
      '</table><p class="muted">Each verdict is exact over the whole load-angle range of the claim, not sampled. A claim marked "another case" is about a different leg or other faults than the rest of this report; it is judged on its own case.</p>',
    );
  }
  if (r.simulation) s.push(simulationSection(r.simulation.sim, r.simulation.segments));
  if (r.faultAtlas) s.push(atlasAppendix(r.faultAtlas));
  s.push(
    `<div class="caution" role="note"><strong>Before operating with a failed device:</strong> confirm the remaining devices' current, voltage and thermal stress, the DC-link capacitor ripple and midpoint balance, and the load, by test and against the device ratings. Local electrical codes and licensed practice come first.</div>`,
  );
  s.push(signOff());
  return `<!DOCTYPE html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>Remedial operation review: ${esc(plan.topology)}, ${esc(faultText)}</title>
<style>${REPORT_CSS}</style>
</head>
<body>
${s.join('\n')}
</body>
</html>
`;
}

// What running degraded costs at the operating point: spectrum, losses, derating, midpoint.
function simulationSection(sim: Simulation, segments: readonly WaveformSegment[]): string {
  const out: string[] = ['<h2>9. What degraded operation costs</h2>'];
  const mid = (x: Simulation['midpoint']) =>
    x.chargePkPkAs === null
      ? '—'
      : `${x.ripplePkPk === null ? `${fmt(x.chargePkPkAs, 3)} As` : `${fmt(x.ripplePkPk, 1)} V peak to peak`} (${fmt(x.averageCurrent ?? 0, 1)} A)`;
  const lv = sim.lineVoltage;
  const hv = sim.healthy.lineVoltage;
  out.push(
    `<p>One fundamental period simulated at m = ${fmt(sim.m, 4)}, ${fmt(sim.currentPeak, 1)} A peak phase current lagging ${fmt(sim.loadAngleDeg, 1)}°, Vdc = ${fmt(sim.vdc, 0)} V, f1 = ${fmt(sim.f1, 1)} Hz, fsw = ${fmt(sim.fsw, 0)} Hz, devices: ${esc(sim.deviceParameters)} (method and loss model: docs/simulate.md).</p>`,
  );
  out.push(
    `<table><tr><th></th><th>faulted</th><th>healthy</th></tr><tr><th>line voltage, fundamental</th><td>${fmt(lv.fundamentalPeak / Math.SQRT2, 1)} V rms</td><td>${fmt(hv.fundamentalPeak / Math.SQRT2, 1)} V rms</td></tr>` +
      `<tr><th>THD / WTHD of the line voltage</th><td>${fmt(100 * lv.thd, 2)} % / ${fmt(100 * lv.wthd, 3)} %</td><td>${fmt(100 * hv.thd, 2)} % / ${fmt(100 * hv.wthd, 3)} %</td></tr>` +
      `<tr><th>hottest element</th><td>${esc(sim.hottest.device)}: ${fmt(sim.hottest.loss, 1)} W</td><td>${esc(sim.healthy.hottest.device)}: ${fmt(sim.healthy.hottest.loss, 1)} W</td></tr>` +
      `<tr><th>midpoint swing over the period (average midpoint current)</th><td>${mid(sim.midpoint)}</td><td>${mid(sim.healthy.midpoint)}</td></tr></table>`,
  );
  if ([sim.midpoint, sim.healthy.midpoint].some((x) => Math.abs(x.averageCurrent ?? 0) > 0.005 * sim.currentPeak))
    out.push(
      '<p class="muted">A non-zero average midpoint current makes the midpoint drift over the period: the switching table applies one realisation per vertex (the fewest gate changes). Firmware that splits the dwell of small vectors between their P- and N-type realisations (listed in the C header) can hold the average at zero up to mMaxBalanced (section 2).</p>',
    );
  out.push(
    `<p><strong>Current derating: ${fmt(100 * sim.currentDerating.factor, 1)} %</strong> of the given current keeps every element within the healthy leg's largest loss${sim.currentDerating.limitingDevice ? ` (limited by ${esc(sim.currentDerating.limitingDevice)})` : ''}; ${esc(sim.currentDerating.assumption)}.</p>`,
  );
  if (sim.lineDevicesAtPwm.length)
    out.push(
      `<p class="flag">Line-frequency devices switched at PWM rate: ${esc(sim.lineDevicesAtPwm.map((x) => `${x.device} (${fmt(x.switchingLoss, 1)} W)`).join(', '))}.</p>`,
    );
  if (sim.wrongSignTime > 0)
    out.push(
      `<p class="flag">For ${fmt(sim.wrongSignTime * 1e6, 1)} µs a phase current had the other sign than its period was planned for; a larger polarity margin avoids it.</p>`,
    );
  out.push(
    figure(lossBarsSvg(sim), 'Losses of every element over one fundamental period, healthy (blue) and faulted (orange), conduction and switching stacked.'),
  );
  out.push(figure(spectrumSvg(sim, { log: true }), 'Line-voltage spectrum a-b in % of the fundamental (log scale): faulted stems, healthy dots.'));
  out.push(figure(waveformsSvg(sim, segments), 'One fundamental period: line voltage a-b and the phase currents a and b.'));
  return out.join('\n');
}

// The header a reviewer signs against: scenario data, how the report was made, every input's hash.
function reviewHeader(r: ReportInputs, vdc: number | undefined): string {
  const sc = r.scenario;
  const rows: [string, string][] = [];
  if (sc) {
    rows.push(['drive', sc.drive]);
    if (sc.ratedPowerKw !== undefined) rows.push(['rated power', `${fmt(sc.ratedPowerKw, 1)} kW`]);
    if (sc.ratedLineVoltageV !== undefined) rows.push(['rated line voltage', `${fmt(sc.ratedLineVoltageV, 0)} V RMS line to line`]);
    if (sc.fundamentalHz !== undefined) rows.push(['fundamental frequency', `${fmt(sc.fundamentalHz, 1)} Hz`]);
    if (sc.switchingHz !== undefined) rows.push(['switching frequency', `${fmt(sc.switchingHz, 0)} Hz`]);
    if (sc.dcLinkCapacitanceF !== undefined) rows.push(['DC-link capacitance', `${fmt(sc.dcLinkCapacitanceF * 1e6, 0)} µF per half`]);
    if (sc.loadAngleRangeDeg)
      rows.push([
        'load-angle range',
        `${fmt(sc.loadAngleRangeDeg[0], 1)}° to ${fmt(sc.loadAngleRangeDeg[1], 1)}° (operating point ${fmt(r.plan.loadAngleDeg, 1)}°)`,
      ]);
  }
  if (vdc !== undefined) rows.push(['DC-link voltage', `${fmt(vdc, 1)} V (Vdc/2 = ${fmt(vdc / 2, 1)} V)`]);
  rows.push(['rules', describeRules(r.plan.rules)]);
  if (r.commandLine) rows.push(['made by', r.commandLine]);
  rows.push(['tool', r.generatedBy]);
  if (r.date) rows.push(['date', r.date]);
  const inputs = (r.inputs ?? []).map((x) => `<div><code>${esc(x.path)}</code><br><code class="hash">SHA-256 ${esc(x.sha256)}</code></div>`).join('');
  return (
    `<h2>Review header</h2><table class="header">${rows.map(([k, v]) => `<tr><th>${esc(k)}</th><td>${k === 'made by' ? `<code>${esc(v)}</code>` : esc(v)}</td></tr>`).join('')}` +
    `<tr><th>input files</th><td>${inputs || 'none (built-in leg, options on the command line)'}</td></tr></table>`
  );
}

// A block to sign on paper: who prepared and who reviewed, the date and the decision.
function signOff(): string {
  const line = '<span class="sign-line"></span>';
  return (
    `<div class="sign-off"><h2>Sign-off</h2><table><tr><th>prepared by</th><td>${line}</td><th>date</th><td>${line}</td></tr>` +
    `<tr><th>reviewed by</th><td>${line}</td><th>date</th><td>${line}</td></tr>` +
    '<tr><th>decision</th><td colspan="3">☐ continue at full voltage &nbsp; ☐ continue with derating to m ≤ ______ &nbsp; ☐ stop the drive until repaired</td></tr>' +
    `<tr><th>conditions, tests</th><td colspan="3" class="sign-box"></td></tr></table>` +
    '<p class="muted">Signing confirms the review of these figures, not the safety of the hardware: confirm device stress, DC-link ripple, midpoint balance and load behaviour by test.</p></div>'
  );
}

// Rows listed in the appendix table; a pair atlas has more (the CSV of `atlas` lists them all).
const ATLAS_ROWS = 300;

function atlasAppendix(a: FaultAtlas): string {
  const count = (v: string) => a.entries.filter((e) => e.verdict === v).length;
  const words = { full: 'full voltage', derated: 'derated', 'cannot-run': 'CANNOT RUN' } as const;
  const [lo, hi] = a.loadAngleRangeDeg;
  const out: string[] = [];
  out.push(`<h2>Appendix: every ${a.pairs ? 'pair of faults' : 'single fault'} of this leg (fault atlas)</h2>`);
  out.push(
    `<p>${a.entries.length} fault sets, modes ${esc(a.modes.join(', '))}, load angle ${fmt(lo, 1)}° to ${fmt(hi, 1)}°, polarity margin ${fmt(a.polarityMarginDeg, 1)}°, rules: ${esc(describeRules(a.rules))}. <strong>${count('full')}</strong> keep full voltage, <strong>${count('derated')}</strong> need derating, <strong class="verdict-fails">${count('cannot-run')}</strong> cannot run (the drive must stop; protection must not try to continue). Each minimum is exact over the whole range.${a.pairs ? '' : ' Faults in phases b and c give the same figures (phase rotation).'}</p>`,
  );
  out.push(
    figure(
      a.pairs ? atlasPairMatrixSvg(a) : atlasHeatmapSvg(a),
      a.pairs
        ? 'Worst-case derating ratio of every pair of faults over the load-angle range; × marks pairs that leave the leg unable to run.'
        : 'mMax as a fraction of the healthy limit for every single fault (rows, worst first) at each load angle of the grid (columns); × marks load angles where the leg cannot run.',
    ),
  );
  out.push('<table><tr><th>faults</th><th>verdict</th><th>mMax min</th><th>ratio</th><th>worst at</th><th>hull bound</th><th>why</th></tr>');
  for (const e of a.entries.slice(0, ATLAS_ROWS)) {
    out.push(
      `<tr><td>${esc(e.faults.join(' + '))}</td><td class="${e.verdict === 'cannot-run' ? 'verdict-fails' : e.verdict === 'full' ? 'verdict-holds' : ''}">${words[e.verdict]}</td><td>${fmt(e.mMaxMin, 4)}</td><td>${fmt(e.deratingRatio * 100, 1)} %</td><td>${fmt(e.worstLoadAngleDeg, 1)}°</td><td>${fmt(e.mMaxHullMin, 4)}</td><td>${esc(e.reason)}</td></tr>`,
    );
  }
  out.push('</table>');
  if (a.entries.length > ATLAS_ROWS)
    out.push(`<p class="muted">The ${ATLAS_ROWS} worst of ${a.entries.length} are listed; <code>hexsalvage atlas --csv</code> lists them all.</p>`);
  return out.join('\n');
}

function figure(svg: string, caption: string): string {
  return `<div class="figure">${svg.replace(/^<\?xml[^>]*>\s*/, '')}<p>${esc(caption)}</p></div>`;
}

function flagRow(label: string, list: readonly { polarity: string; triangle: number; detail: readonly string[] }[]): string {
  const ex = list
    .slice(0, 3)
    .map((x) => `${x.polarity} #${x.triangle}: ${x.detail.join(' ')}`)
    .join('; ');
  return `<tr><td>${esc(label)}</td><td${list.length ? ' class="flag"' : ''}>${list.length}</td><td>${esc(ex || '—')}${list.length > 3 ? ' …' : ''}</td></tr>`;
}

function bindingExplanation(plan: RemedialPlan): string {
  if (!plan.bindingEdge) {
    return `The drive cannot run in this state: ${plan.stop?.reason ?? `under the polarity ${plan.limitingPolarity} the triangles a switching sequence can safely run do not surround the origin.`} No balanced three-phase voltage can be synthesised through that part of the cycle.`;
  }
  const [a, b] = plan.bindingEdge;
  const v = (x: typeof a) => `the ${x.class} vector ${tripletText(x.levels[0] ?? [], plan.dcLevels)} (α ${fmt(x.alpha, 3)}, β ${fmt(x.beta, 3)})`;
  return `The limit binds at θ = ${fmt(plan.limitingAngleDeg, 2)}°, where the phase currents read ${plan.limitingPolarity} (a, b, c). There the reference leaves the region of safely runnable triangles through the edge from ${v(a)} to ${v(b)}: the reference vector can be no longer than ${fmt(plan.mMax, 4)} in that direction, against ${fmt(plan.mMaxHealthy, 4)} for the healthy leg.`;
}

// What the rated voltage needs against what the fault leaves, in the drive's terms (scenario data).
function ratedVoltageText(atlas: DiagramAtlas, plan: RemedialPlan, sc: ReportScenario | undefined, vdc: number | undefined): string | null {
  if (sc?.ratedLineVoltageV === undefined || vdc === undefined) return null;
  const rated = sc.ratedLineVoltageV;
  const need = modulationOfLineRms(rated, vdc);
  const here = lineRmsVolts(plan.mMax, vdc);
  const [lo, hi] = sc.loadAngleRangeDeg ?? [plan.loadAngleDeg, plan.loadAngleDeg];
  const worst = limitOverLoadAngles(atlas.faulted, lo, hi, plan.polarityMarginDeg);
  const worstV = lineRmsVolts(worst.mMax, vdc);
  const share = Math.min(here, worstV) / rated;
  const verdict =
    need <= worst.mMax + 1e-12
      ? 'the rated voltage remains available over the whole load-angle range'
      : `the rated voltage is NOT available: at most ${fmt(100 * share, 0)} % of it over the load-angle range; under a constant V/f law (common practice) that is about ${fmt(100 * share, 0)} % of rated speed, so a pump or fan (load torque rising with the square of speed) would run at about that share of its flow and ${fmt(100 * share ** 3, 0)} % of its power — confirm with the load's own curve`;
  return `Rated line voltage ${fmt(rated, 0)} V RMS needs m = ${fmt(need, 4)} at Vdc = ${fmt(vdc, 0)} V. With the fault the leg gives at most m = ${fmt(plan.mMax, 4)} (${fmt(here, 1)} V) at the operating load angle ${fmt(plan.loadAngleDeg, 1)}°, and at least ${fmt(worstV, 1)} V over ${fmt(lo, 1)}° to ${fmt(hi, 1)}°: ${verdict}.`;
}

// What could be done about the fault: every remedy that applies, best first, in the drive's terms.
function remediesSection(list: readonly Remedy[], plan: RemedialPlan, volts: (m: number) => string): string {
  const rows = list
    .map(
      (x) =>
        `<tr><td><code>${esc(x.id)}</code></td><td>${esc(x.description)}</td><td><strong>${fmt(x.mMax, 4)}</strong>${esc(volts(x.mMax))}</td><td>${fmt(x.mMaxBalanced, 4)}</td><td>${esc(x.requires)}</td></tr>`,
    )
    .join('');
  const runs = list.filter((x) => x.id !== 'as-is' && x.mMax > 0);
  const verdict =
    plan.mMax > 0
      ? ''
      : runs.length
        ? `<p class="flag">As it is the drive cannot run; with <code>${esc(runs[0]?.id ?? '')}</code> it could, up to m = ${fmt(runs[0]?.mMax ?? 0, 4)}. That needs ${esc(runs[0]?.requires ?? '')}.</p>`
        : `<p class="verdict-fails">No remedy considered here lets the drive run: it must stop until repaired.${plan.dcLevels.includes(0) ? '' : ' A bypass to the DC midpoint needs a split DC link (a node at potential 0); this leg has none.'}</p>`;
  return (
    `<h3>Remedies</h3><p>What could be done about the fault, best first, at the same load angle and under the same rules (each a change to the hardware that a qualified person must design, fit and test).</p>` +
    `<table><tr><th>remedy</th><th>what is done</th><th>mMax</th><th>midpoint held to</th><th>requires</th></tr>${rows}</table>${verdict}`
  );
}

// From the fault to the degraded table: what the healthy table does meanwhile, and the way out.
function switchoverSection(sw: Switchover): string {
  const out: string[] = ['<h2>7. From the fault to the degraded table</h2>'];
  const rows: string[] = [];
  for (const [ph, pats] of Object.entries(sw.details)) {
    for (const [name, cells] of Object.entries(pats)) {
      if (cells['+'].class === 'same' && cells['-'].class === 'same') continue;
      const cell = (c: (typeof cells)['+']) =>
        `<td class="${c.class === 'unsafe' ? 'verdict-fails' : ''}">${c.class}${c.class === 'deviates' ? ` (${fmt(c.healthyLevel ?? 0, 2)} → ${fmt(c.level ?? 0, 2)})` : ''}</td>`;
      rows.push(
        `<tr><td>${ph}</td><td>${esc(name)}</td>${cell(cells['+'])}${cell(cells['-'])}<td>${esc([cells['+'].reason, cells['-'].reason].filter(Boolean).join('; '))}</td></tr>`,
      );
    }
  }
  out.push(
    '<p>Until the diagnosis acts, the healthy table keeps running with the fault present. Each healthy pattern per current sign: <em>same</em> (its level), <em>deviates</em> (another level: distortion) or <em>unsafe</em> (a shoot-through, a broken current or a device over its rating). Patterns that stay the same for both signs are not listed.</p>',
  );
  out.push(
    rows.length
      ? `<table><tr><th>phase</th><th>pattern</th><th>i &gt; 0</th><th>i &lt; 0</th><th>why</th></tr>${rows.join('')}</table>`
      : '<p>Every healthy pattern still gives its level: the fault changes nothing the healthy table commands.</p>',
  );
  if (sw.run) {
    const r = sw.run;
    out.push(
      `<p>At the operating point (m = ${fmt(r.m, 4)}, φ = ${fmt(r.loadAngleDeg, 1)}°, f1 = ${fmt(r.f1, 1)} Hz, fsw = ${fmt(r.fsw, 0)} Hz) the healthy runtime applies ${r.states} states per fundamental period: ${r.unsafeStates} unsafe (${fmt(100 * r.unsafeShare, 1)} % of the time), ${r.deviatingStates} deviating.</p>`,
    );
    out.push(`<p class="${r.urgency === 'hardware' ? 'verdict-fails' : 'verdict-holds'}">${esc(r.verdict.charAt(0).toUpperCase() + r.verdict.slice(1))}.</p>`);
  }
  const exits = sw.exits.filter((e) => e.steps === null || e.steps.length > 0);
  out.push(
    exits.length
      ? `<p>After detection, the way from each healthy state of a faulted phase into the degraded table (single gate actions, every state on the way usable for the current's sign):</p><table><tr><th>phase</th><th>from</th><th>sign</th><th>gate actions → pattern</th></tr>${exits.map((e) => `<tr><td>${e.phase}</td><td>${esc(e.pattern)}</td><td>i ${e.sign === '+' ? '&gt;' : '&lt;'} 0</td><td${e.steps === null ? ' class="verdict-fails"' : ''}>${esc(e.steps === null ? (e.blockAll ?? 'none') : `${e.steps.join(', ')} → ${e.to}`)}</td></tr>`).join('')}</table>`
      : '<p>Every healthy state the runtime uses is already a state of the degraded table: the tables can be switched at the next switching period.</p>',
  );
  return out.join('\n');
}
