import { dirname, relative, resolve } from 'node:path';
import {
  modulationOfLineRms,
  simulatePeriod,
  switchover,
  simulationWaveform,
  type ClaimVerdict,
  type LegNetlist,
  type LevelStepRule,
  type SequenceMode,
} from '@hexsalvage/core';
import { diagramAtlas, planFromAtlas, planRemedies, switchingTableFromAtlas } from '@hexsalvage/core/internal';
import { usage, type ParsedArgs } from '../inputs/args.js';
import { buildDate, commandLine } from '../commandLine.js';
import { fileSha256, readScenario, type Scenario } from '../inputs/readScenario.js';
import { ATLAS_OPTIONS, atlasFromArgs } from '../inputs/atlasInputs.js';
import { ANGLE_OPTIONS, HELP_OPTION, LEG_OPTIONS, RUNTIME_OPTIONS, VDC_OPTION, type Command } from '../command.js';
import { angleInputs, legInputs, runtimeInputs, vdcInput } from '../inputs/legInputs.js';
import { writeFileAtomic } from '../output/output.js';
import { judgeClaimList, judgeClaims } from '../inputs/readClaims.js';
import { buildReport } from '../report/buildReport.js';
import { TOOL_VERSION } from '../toolVersion.js';

/** `hexsalvage report`: one self-contained HTML file for a design review. */
export const reportCommand: Command = {
  name: 'report',
  summary: 'write a self-contained HTML design-review report (header, limit, plots, table, claims, sign-off)',
  usage:
    'report (--scenario FILE.json | --topology T [--fault F]... [--load-angle DEG] [--polarity-margin DEG] [--vdc V] [--claims FILE]) [--sequence S] [--balance on|off] [--atlas [atlas options]] --out FILE.html',
  options: [
    {
      name: 'scenario',
      type: 'string',
      value: 'FILE',
      help: 'a review scenario (docs/schema/scenario.schema.json): drive data, leg, faults, load angles, claims; needs nothing else',
    },
    ...LEG_OPTIONS,
    ...ANGLE_OPTIONS,
    VDC_OPTION,
    { name: 'claims', type: 'string', value: 'FILE', help: 'also show the verdicts of a claims file' },
    ...RUNTIME_OPTIONS,
    { name: 'atlas', type: 'flag', help: 'add an appendix with every fault of the leg (the fault atlas; shaped by the atlas options)' },
    ...ATLAS_OPTIONS,
    { name: 'out', type: 'string', value: 'FILE', help: 'output .html file (replaced atomically)' },
    HELP_OPTION,
  ],
  run: async (args, io) => {
    const out = args.values.get('out');
    if (typeof out !== 'string' || !out.endsWith('.html')) throw usage('--out', 'a file name ending in .html', out);
    const scenarioFile = args.values.get('scenario') as string | undefined;
    let inputs: {
      topology: string | LegNetlist;
      topologyText: string;
      faults: readonly string[];
      rules: { ignoreRatings: boolean; levelSteps: LevelStepRule };
      loadAngleDeg: number;
      polarityMarginDeg: number;
      vdc: number | undefined;
    };
    let verdicts: ClaimVerdict[] | undefined;
    let scenario: Scenario | undefined;
    const files: { path: string; sha256: string }[] = [];
    if (scenarioFile !== undefined) {
      const clash =
        ['topology', 'load-angle', 'polarity-margin', 'vdc', 'claims', 'level-steps'].find((k) => args.values.has(k)) ??
        ((args.lists.get('fault') ?? []).length ? 'fault' : undefined);
      if (clash) throw usage(`--${clash}`, 'not together with --scenario (the scenario file gives it)');
      scenario = readScenario(scenarioFile);
      const rules = { ignoreRatings: args.flags.has('ignore-ratings'), levelSteps: scenario.levelSteps ?? 'commutable' };
      inputs = {
        topology: scenario.topology,
        topologyText: scenario.topologyText,
        faults: scenario.faults,
        rules,
        loadAngleDeg: scenario.loadAngleDeg,
        polarityMarginDeg: scenario.polarityMarginDeg,
        vdc: scenario.vdc,
      };
      verdicts = scenario.claims.length ? judgeClaimList(scenario.claims, scenarioFile, rules.ignoreRatings, 'claims', 'scenario') : undefined;
      files.push(...scenario.inputs);
    } else {
      const leg = legInputs(args);
      inputs = { ...leg, ...angleInputs(args), vdc: vdcInput(args) };
      const claimsFile = args.values.get('claims') as string | undefined;
      verdicts = claimsFile ? judgeClaims(claimsFile, leg.rules.ignoreRatings) : undefined;
      if (typeof inputs.topology !== 'string') files.push({ path: resolve(leg.topologyText), sha256: fileSha256(leg.topologyText) });
      if (claimsFile) files.push({ path: resolve(claimsFile), sha256: fileSha256(claimsFile) });
    }
    const atlas = diagramAtlas({ topology: inputs.topology, faults: inputs.faults, ...inputs.rules });
    const atlasFlags = ['modes', 'load-angle-range', 'step', 'jobs'].filter((k) => args.values.has(k)).concat(args.flags.has('pairs') ? ['pairs'] : []);
    if (!args.flags.has('atlas') && atlasFlags.length > 0) throw usage(`--${atlasFlags[0]}`, 'only together with --atlas');
    const faultAtlas = args.flags.has('atlas')
      ? await atlasFromArgs(scenario && scenarioFile ? withScenario(args, scenario, scenarioFile) : args, io, false, true)
      : undefined;
    const plan = planFromAtlas(atlas, inputs.loadAngleDeg, inputs.polarityMarginDeg);
    const runtime = runtimeInputs(args);
    const simulation = scenario ? scenarioSimulation(scenario, { ...inputs, runtime }, plan.mMax) : undefined;
    const legOptions = { topology: inputs.topology, faults: inputs.faults, ...inputs.rules };
    const remedies = planRemedies(atlas, legOptions, inputs.loadAngleDeg, inputs.polarityMarginDeg);
    const bypassed = (inputs.rules as { bypass?: string }).bypass !== undefined;
    const switchoverDoc =
      inputs.faults.length === 0 || bypassed
        ? undefined
        : switchover({ ...legOptions, ...scenarioPoint(scenario, inputs.loadAngleDeg, inputs.polarityMarginDeg) });
    const html = buildReport({
      atlas,
      plan,
      ...(simulation ? { simulation } : {}),
      remedies,
      ...(switchoverDoc ? { switchover: switchoverDoc } : {}),
      table: switchingTableFromAtlas(atlas),
      runtime,
      topologyText: inputs.topologyText,
      ...(verdicts ? { verdicts } : {}),
      ...(faultAtlas ? { faultAtlas } : {}),
      ...(scenario ? { scenario } : {}),
      ...(inputs.vdc !== undefined ? { vdc: inputs.vdc } : {}),
      generatedBy: `hexsalvage ${TOOL_VERSION}`,
      commandLine: commandLine('report', reportCommand.options, args),
      date: buildDate(),
      inputs: files.map((f) => ({ path: relative(process.cwd(), f.path) || f.path, sha256: f.sha256 })),
    });
    await writeFileAtomic(out, html);
    await io.stdout(`wrote ${out} (review report, ${Buffer.byteLength(html)} bytes)\n`);
    return 0;
  },
};

// The operating point of the healthy runtime before the diagnosis acts: the scenario's rated
// voltage (at most the healthy limit, 2/√3) at its frequencies; none without the drive's data.
function scenarioPoint(
  sc: Scenario | undefined,
  loadAngleDeg: number,
  polarityMarginDeg: number,
): { m?: number; loadAngleDeg?: number; polarityMarginDeg?: number; f1?: number; fsw?: number } {
  if (!sc || sc.ratedLineVoltageV === undefined || sc.fundamentalHz === undefined || sc.switchingHz === undefined || sc.switchingHz < 6 * sc.fundamentalHz)
    return {};
  return {
    m: Math.min(2 / Math.sqrt(3), modulationOfLineRms(sc.ratedLineVoltageV, sc.vdc)),
    loadAngleDeg,
    polarityMarginDeg,
    f1: sc.fundamentalHz,
    fsw: sc.switchingHz,
  };
}

// One simulated period at the scenario's operating point, when it gives the drive's data: m is the
// rated voltage's, or the safe limit where that is lower; the current is the rated one,
// √2·P / (√3·V·cos φ) at the operating load angle.
function scenarioSimulation(
  sc: Scenario,
  inputs: {
    topology: string | LegNetlist;
    faults: readonly string[];
    rules: { ignoreRatings: boolean; levelSteps: LevelStepRule };
    loadAngleDeg: number;
    polarityMarginDeg: number;
    runtime: { sequence: SequenceMode; balance: 'on' | 'off' };
  },
  mMax: number,
) {
  if (sc.ratedPowerKw === undefined || sc.ratedLineVoltageV === undefined || sc.fundamentalHz === undefined || sc.switchingHz === undefined || mMax <= 0)
    return undefined;
  const cos = Math.cos((inputs.loadAngleDeg * Math.PI) / 180);
  if (cos < 0.1 || sc.switchingHz < 6 * sc.fundamentalHz) return undefined;
  const options = {
    topology: inputs.topology,
    faults: inputs.faults,
    ...inputs.rules,
    m: Math.min(mMax, modulationOfLineRms(sc.ratedLineVoltageV, sc.vdc)),
    loadAngleDeg: inputs.loadAngleDeg,
    polarityMarginDeg: inputs.polarityMarginDeg,
    vdc: sc.vdc,
    currentPeak: (Math.SQRT2 * sc.ratedPowerKw * 1000) / (Math.sqrt(3) * sc.ratedLineVoltageV * cos),
    f1: sc.fundamentalHz,
    fsw: sc.switchingHz,
    ...(sc.dcLinkCapacitanceF !== undefined ? { capacitance: sc.dcLinkCapacitanceF } : {}),
    ...(sc.deadTimeS !== undefined ? { deadTime: sc.deadTimeS } : {}),
    ...inputs.runtime,
  };
  return { sim: simulatePeriod(options), segments: simulationWaveform(options) };
}

// The atlas options of the command line with the scenario's leg, rule and DC link in place of
// --topology, --level-steps and --vdc (a netlist path in the scenario is relative to its file).
function withScenario(args: ParsedArgs, scenario: Scenario, file: string): ParsedArgs {
  const values = new Map(args.values);
  values.set('topology', typeof scenario.topology === 'string' ? scenario.topologyText : resolve(dirname(file), scenario.topologyText));
  if (scenario.levelSteps) values.set('level-steps', scenario.levelSteps);
  values.set('vdc', scenario.vdc);
  return { ...args, values, lists: new Map([...args.lists].filter(([k]) => k !== 'fault')) };
}
