import os, re, subprocess
SRC='packages/core/src'
folders = {
 'shared': 'errors validate tolerance cautions boundedCache physicalUnits parseJsonText',
 'netlist': 'netlist parseNetlist builtinLegs resolveTopology expandElements faults',
 'geometry': 'clarke hull triangulate dwell triangleUnion outlineGeometry radialExtent locateReference originGaps diagramScale',
 'leg': 'conduction compiledLeg ratingCheck gateSetSolver commutation legTable restrictions rules analyseLeg exploreLeg choosePattern polarity faultReason midpointCurrent',
 'vectors': 'survivingVectors classifyVectors admissibleTriangles admissibleTiling polarityDiagram polaritySectors diagramAtlas levelNotation legDocument',
 'limits': 'modulationLimit deratingCurve midpointBalance planLimits remedies planRemedial evaluateClaim',
 'table': 'polarityTable switchingSequence patternSteps switchingTable createModulator runtimeProgram createRuntime runtimeStream samplePeriod cycleCheck switchover',
 'export': 'exportC exportCsv exportJson cRuntime',
 'atlas': 'faultAtlas',
 'simulate': 'simulatePeriod deviceLosses currentPaths',
}
newpath = {}
for f, names in folders.items():
    for n in names.split():
        newpath[os.path.abspath(f'{SRC}/{n}.ts')] = os.path.abspath(f'{SRC}/{f}/{n}.ts')
# every existing core file must be mapped, except index.ts and node/
for fn in os.listdir(SRC):
    if fn.endswith('.ts') and fn != 'index.ts':
        assert os.path.abspath(f'{SRC}/{fn}') in newpath, fn
def loc(p):  # new location of a file (old absolute path)
    return newpath.get(p, p)
def rel(frm_file, to_file):
    r = os.path.relpath(to_file, os.path.dirname(frm_file))
    if not r.startswith('.'): r = './' + r
    return r
# files whose imports to rewrite: all core src ts (incl node/, index)
core_files = []
for root, _, fs in os.walk(SRC):
    for fn in fs:
        if fn.endswith('.ts'): core_files.append(os.path.abspath(os.path.join(root, fn)))
spec_re = re.compile(r"""((?:import|export)\s[^'";]*?from\s+|import\s*\(\s*)'(\.{1,2}/[^']+)'""")
def rewrite(file_old, text, file_new):
    def fix(m):
        spec = m.group(2)
        target_old = os.path.normpath(os.path.join(os.path.dirname(file_old), spec))
        tgt_ts = re.sub(r'\.js$', '.ts', target_old)
        if tgt_ts in newpath or tgt_ts in core_files:
            new_t = loc(tgt_ts)
            r = rel(file_new, new_t)
            r = re.sub(r'\.ts$', '.js', r)
            return f"{m.group(1)}'{r}'"
        return m.group(0)
    return spec_re.sub(fix, text)
contents = {}
for f in core_files:
    contents[f] = rewrite(f, open(f).read(), loc(f))
for f in folders: os.makedirs(f'{SRC}/{f}', exist_ok=True)
for old, new in newpath.items():
    subprocess.run(['git', 'mv', os.path.relpath(old), os.path.relpath(new)], check=True)
for f, text in contents.items():
    open(loc(f), 'w').write(text)
# tests and other places naming core/src/<name>
name_to_folder = {n: f for f, ns in folders.items() for n in ns.split()}
def fix_paths(path):
    s = open(path).read()
    t = re.sub(r"packages/core/src/([A-Za-z]+)\.(js|ts)", lambda m: f"packages/core/src/{name_to_folder[m.group(1)]}/{m.group(1)}.{m.group(2)}" if m.group(1) in name_to_folder else m.group(0), s)
    if t != s: open(path, 'w').write(t); print('fixed', path)
for root, _, fs in os.walk('.'):
    if 'node_modules' in root or '/.git' in root or '/dist' in root: continue
    for fn in fs:
        if fn.endswith(('.ts', '.mjs', '.json', '.md')) and not fn.endswith('.tmp.mjs'):
            fix_paths(os.path.join(root, fn))
