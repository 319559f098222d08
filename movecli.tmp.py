import os, re, subprocess
SRC='packages/cli/src'
folders = {
 'inputs': 'args atlasInputs legInputs loadTopology readClaims readScenario simulateInputs',
 'output': 'output progressLine renderFile',
 'atlas': 'atlasPool atlasWorker',
}
newpath = {}
for f, names in folders.items():
    for n in names.split():
        newpath[os.path.abspath(f'{SRC}/{n}.ts')] = os.path.abspath(f'{SRC}/{f}/{n}.ts')
def loc(p): return newpath.get(p, p)
def rel(frm, to):
    r = os.path.relpath(to, os.path.dirname(frm))
    return r if r.startswith('.') else './' + r
files = []
for root, _, fs in os.walk(SRC):
    for fn in fs:
        if fn.endswith('.ts'): files.append(os.path.abspath(os.path.join(root, fn)))
for root, _, fs in os.walk('packages/cli/explorer/src'):
    for fn in fs:
        if fn.endswith('.ts'): files.append(os.path.abspath(os.path.join(root, fn)))
spec_re = re.compile(r"""((?:import|export)\s[^'";]*?from\s+|import\s*\(\s*)'(\.{1,2}/[^']+)'""")
allsrc = set(f for f in files)
def rewrite(file_old, text, file_new):
    def fix(m):
        spec = m.group(2)
        tgt = re.sub(r'\.js$', '.ts', os.path.normpath(os.path.join(os.path.dirname(file_old), spec)))
        if tgt in allsrc:
            r = re.sub(r'\.ts$', '.js', rel(file_new, loc(tgt)))
            return f"{m.group(1)}'{r}'"
        return m.group(0)
    return spec_re.sub(fix, text)
contents = {f: rewrite(f, open(f).read(), loc(f)) for f in files}
for f in folders: os.makedirs(f'{SRC}/{f}', exist_ok=True)
for old, new in newpath.items():
    subprocess.run(['git', 'mv', os.path.relpath(old), os.path.relpath(new)], check=True)
for f, text in contents.items(): open(loc(f), 'w').write(text)
name_to_folder = {n: f for f, ns in folders.items() for n in ns.split()}
for root, _, fs in os.walk('.'):
    if 'node_modules' in root or '/.git' in root or '/dist' in root: continue
    for fn in fs:
        if fn.endswith(('.ts', '.mjs', '.md')) and not fn.endswith('.tmp.mjs'):
            p = os.path.join(root, fn)
            s = open(p).read()
            t = re.sub(r"packages/cli/src/([A-Za-z]+)\.(js|ts)", lambda m: f"packages/cli/src/{name_to_folder[m.group(1)]}/{m.group(1)}.{m.group(2)}" if m.group(1) in name_to_folder else m.group(0), s)
            if t != s: open(p, 'w').write(t); print('fixed', p)
