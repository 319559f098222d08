import re, os, subprocess
PUBLIC = set('''analyseLeg legDocument exploreLeg planRemedial deratingCurve deratingSteps modulationLimit switchingTable createModulator
createRuntime runtimeStream cycleCheck samplePeriod exportC exportCsv exportJson exportDocument faultAtlas evaluateClaim simulatePeriod
simulationWaveform switchover polarityDocument BUILTIN_TOPOLOGIES builtinLeg isBuiltinTopology parseNetlist parseJsonText parseFault
parseFailures formatFault PHASES FAULT_MODES LEVEL_STEP_RULES SEQUENCE_MODES UPDATE_MODES POLARITY_STRINGS polarityAt parsePolarity
CAUTIONS HexsalvageInputError levelNotation lineRmsVolts phasePeakVolts modulationOfLineRms describeRules unsafeRules
REFERENCE_LIMIT MAX_SIMULATED_PERIODS'''.split())
idx = open('packages/core/src/index.ts').read()
# parse export statements (possibly multi-line)
stmts = re.findall(r"export\s*(type\s*)?\{([^}]*)\}\s*from\s*'([^']+)';", idx, re.S)
pub_lines, int_lines = [], []
pub_names, all_runtime = set(), set()
for is_type, body, src in stmts:
    names = [n.strip() for n in body.split(',') if n.strip()]
    pub, priv = [], []
    for n in names:
        typ = bool(is_type) or n.startswith('type ')
        base = n.replace('type ', '').split(' as ')[-1].strip()
        if typ or base in PUBLIC:
            pub.append(n if not is_type else n)
            pub_names.add(base)
        else:
            priv.append(n)
            all_runtime.add(base)
    if pub: pub_lines.append(f"export {is_type or ''}{{ {', '.join(pub)} }} from '{src}';")
    if priv: int_lines.append(f"export {{ {', '.join(priv)} }} from '{src}';")
missing = PUBLIC - pub_names
print('public names not found:', missing)
header = idx[:idx.index('export')]
open('packages/core/src/index.ts','w').write(header + '\n'.join(pub_lines) + '\n')
open('packages/core/src/internal.ts','w').write('''/**
 * `@hexsalvage/core/internal`: the building blocks behind the public entry points, for the
 * hexsalvage packages (plot, CLI, explorer) and the tests. No stability promise: names here may
 * change in any release. Everything public is re-exported too.
 *
 * @packageDocumentation
 */
export * from './index.js';
''' + '\n'.join(int_lines) + '\n')
INTERNAL = all_runtime
print('internal runtime names:', len(INTERNAL), 'public runtime:', len([n for n in pub_names if n in PUBLIC]))
# rewrite imports in consumers
imp_re = re.compile(r"import\s*(type\s*)?\{([^}]*)\}\s*from\s*'@hexsalvage/core';")
files = subprocess.run(['git','ls-files','packages/plot/src','packages/cli/src','packages/cli/explorer/src','test','bench','scripts'],capture_output=True,text=True).stdout.split()
for f in files:
    if not f.endswith(('.ts','.mjs')): continue
    s = open(f).read()
    def fix(m):
        is_type, body = m.group(1), m.group(2)
        names = [n.strip() for n in body.split(',') if n.strip()]
        pub = [n for n in names if is_type or n.startswith('type ') or n.split(' as ')[0].strip() not in INTERNAL]
        priv = [n for n in names if not (is_type or n.startswith('type ')) and n.split(' as ')[0].strip() in INTERNAL]
        out = []
        if pub: out.append(f"import {is_type or ''}{{ {', '.join(pub)} }} from '@hexsalvage/core';")
        if priv: out.append(f"import {{ {', '.join(priv)} }} from '@hexsalvage/core/internal';")
        return '\n'.join(out)
    t = imp_re.sub(fix, s)
    # namespace imports (import * as core from '@hexsalvage/core') get the internal entry
    t = t.replace("import * as core from '@hexsalvage/core';", "import * as core from '@hexsalvage/core/internal';")
    if t != s: open(f,'w').write(t); print('rewrote', f)
