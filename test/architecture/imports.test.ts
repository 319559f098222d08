import { existsSync, readdirSync, readFileSync, statSync } from 'node:fs';
import { dirname, join, relative, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { ROOT } from '../support/cli.js';

// The house rules, checked on the sources: no import cycle anywhere (type-only imports count), the
// core's folders import only downward, each folder is small and says what it holds, and packages
// import only the packages below them.
const CORE = join(ROOT, 'packages/core/src');
/** The core's folders from the bottom up; a folder may import its own and those before it. */
const LAYERS = [['shared'], ['netlist'], ['geometry'], ['leg'], ['vectors'], ['limits'], ['table'], ['export', 'atlas', 'simulate'], ['node']];

function sources(dir: string): string[] {
  return readdirSync(dir).flatMap((f) => {
    const p = join(dir, f);
    return statSync(p).isDirectory() ? sources(p) : p.endsWith('.ts') ? [p] : [];
  });
}

/** Relative imports and re-exports of a file (type-only included), as absolute .ts paths. */
function importsOf(file: string): string[] {
  const text = readFileSync(file, 'utf8');
  return [...text.matchAll(/^(?:import|export)\s[^'";]*?from\s+'(\.{1,2}\/[^']+)'|import\(\s*'(\.{1,2}\/[^']+)'\s*\)/gm)].map((m) =>
    resolve(dirname(file), (m[1] ?? m[2] ?? '').replace(/\.js$/, '.ts')),
  );
}

/** Strongly connected components with more than one file, or a file importing itself. */
function cycles(files: readonly string[]): string[][] {
  const graph = new Map(files.map((f) => [f, importsOf(f).filter((t) => existsSync(t))]));
  let counter = 0;
  const index = new Map<string, number>();
  const low = new Map<string, number>();
  const stack: string[] = [];
  const onStack = new Set<string>();
  const found: string[][] = [];
  const visit = (v: string) => {
    index.set(v, counter);
    low.set(v, counter++);
    stack.push(v);
    onStack.add(v);
    for (const w of graph.get(v) ?? []) {
      if (!index.has(w)) {
        visit(w);
        low.set(v, Math.min(low.get(v) as number, low.get(w) as number));
      } else if (onStack.has(w)) low.set(v, Math.min(low.get(v) as number, index.get(w) as number));
    }
    if (low.get(v) === index.get(v)) {
      const c: string[] = [];
      let w: string;
      do {
        w = stack.pop() as string;
        onStack.delete(w);
        c.push(relative(ROOT, w));
      } while (w !== v);
      if (c.length > 1 || (graph.get(v) ?? []).includes(v)) found.push(c);
    }
  };
  for (const v of graph.keys()) if (!index.has(v)) visit(v);
  return found;
}

describe('the house', () => {
  it('has no import cycle in any package, type-only imports included', () => {
    for (const dir of ['packages/core/src', 'packages/plot/src', 'packages/cli/src', 'packages/cli/explorer/src']) {
      expect(cycles(sources(join(ROOT, dir))), dir).toEqual([]);
    }
  });

  it('finds a cycle where there is one (the checker itself)', () => {
    const a = join(ROOT, 'test/architecture/fixtures/a.ts');
    expect(cycles([a, join(ROOT, 'test/architecture/fixtures/b.ts')])).toHaveLength(1);
  });

  it('keeps the core in folders by concept: each named in the layers, small, with a README, importing only downward', () => {
    const rank = new Map(LAYERS.flatMap((names, k) => names.map((n) => [n, k] as const)));
    const folders = readdirSync(CORE).filter((f) => statSync(join(CORE, f)).isDirectory());
    expect(folders.sort()).toEqual([...rank.keys()].sort());
    expect(readdirSync(CORE).filter((f) => f.endsWith('.ts'))).toEqual(['index.ts', 'internal.ts']);
    const wrong: string[] = [];
    for (const folder of folders) {
      const files = readdirSync(join(CORE, folder)).filter((f) => f.endsWith('.ts'));
      expect(files.length, folder).toBeLessThanOrEqual(15);
      expect(existsSync(join(CORE, folder, 'README.md')), `${folder}/README.md`).toBe(true);
      for (const f of files) {
        for (const target of importsOf(join(CORE, folder, f))) {
          const to = relative(CORE, target).split('/')[0] as string;
          if (to === 'index.ts' || to === 'internal.ts' || (rank.get(to) as number) > (rank.get(folder) as number))
            wrong.push(`${folder}/${f} imports ${relative(CORE, target)}`);
        }
      }
    }
    expect(wrong).toEqual([]);
  });

  it('keeps every folder of every package at 15 source files or fewer', () => {
    const crowded: string[] = [];
    const visit = (dir: string) => {
      const entries = readdirSync(dir);
      const files = entries.filter((f) => f.endsWith('.ts'));
      if (files.length > 15) crowded.push(`${relative(ROOT, dir)}: ${files.length}`);
      for (const e of entries) if (statSync(join(dir, e)).isDirectory()) visit(join(dir, e));
    };
    for (const pkg of ['core', 'plot', 'cli']) visit(join(ROOT, 'packages', pkg, 'src'));
    visit(join(ROOT, 'packages/cli/explorer/src'));
    expect(crowded).toEqual([]);
  });

  it('keeps the packages layered: core imports no package of ours, plot only core, the CLI core and plot', () => {
    const allowed: Record<string, readonly string[]> = { core: [], plot: ['@hexsalvage/core'], cli: ['@hexsalvage/core', '@hexsalvage/plot'] };
    for (const [pkg, ok] of Object.entries(allowed)) {
      for (const f of sources(join(ROOT, 'packages', pkg, 'src'))) {
        for (const m of readFileSync(f, 'utf8').matchAll(/^(?:import|export)\s[^;]*?from\s+'(@hexsalvage\/[a-z]+|hexsalvage)[^']*'/gm)) {
          expect(ok, `${relative(ROOT, f)} imports ${m[1]}`).toContain(m[1]);
        }
      }
    }
  });
});
