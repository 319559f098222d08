// `pnpm api`: the public surface of each package as a reviewed document (docs/api/<package>.md):
// every export of the entry point with its kind, its declaration (signature, members) and the first
// paragraph of its TSDoc, read from the sources with the TypeScript compiler. A test regenerates
// it and compares (UPDATE_GOLDEN=1 writes it), so a change to the surface shows in review.
import { mkdirSync, writeFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import ts from 'typescript';

const root = fileURLToPath(new URL('..', import.meta.url));
/** Entry points: package name, source file. */
export const ENTRIES = [
  ['@hexsalvage/core', 'packages/core/src/index.ts'],
  ['@hexsalvage/core/node', 'packages/core/src/node/index.ts'],
  ['@hexsalvage/core/internal', 'packages/core/src/internal.ts'],
  ['@hexsalvage/plot', 'packages/plot/src/index.ts'],
];

/**
 * The API document of one entry point.
 *
 * @param name - package name shown in the title
 * @param file - its index.ts, relative to the repository root
 * @returns markdown text
 */
export function apiReport(name, file) {
  const program = ts.createProgram([`${root}${file}`], {
    target: ts.ScriptTarget.ES2022,
    module: ts.ModuleKind.NodeNext,
    moduleResolution: ts.ModuleResolutionKind.NodeNext,
    strict: true,
    noEmit: true,
    skipLibCheck: true,
    types: [],
  });
  const checker = program.getTypeChecker();
  const source = program.getSourceFile(`${root}${file}`);
  const moduleSymbol = checker.getSymbolAtLocation(source);
  const exports = checker.getExportsOfModule(moduleSymbol).sort((a, b) => (a.name < b.name ? -1 : a.name > b.name ? 1 : 0));
  const printer = ts.createPrinter({ removeComments: true });
  const rows = [];
  let values = 0;
  for (const sym of exports) {
    const target = sym.flags & ts.SymbolFlags.Alias ? checker.getAliasedSymbol(sym) : sym;
    const decl = target.declarations?.[0];
    if (!decl) continue;
    const kind = ts.SyntaxKind[decl.kind].replace(/Declaration$/, '').replace(/Statement$/, '');
    const isValue = (target.flags & ts.SymbolFlags.Value) !== 0;
    if (isValue) values++;
    const doc =
      ts
        .displayPartsToString(target.getDocumentationComment(checker))
        .split(/\n\s*\n/)[0]
        ?.replace(/\s+/g, ' ')
        .trim() ?? '';
    let text;
    if (ts.isFunctionDeclaration(decl)) text = `function ${sym.name}${checker.signatureToString(checker.getSignatureFromDeclaration(decl))}`;
    else if (ts.isVariableDeclaration(decl))
      text = `const ${sym.name}: ${checker.typeToString(checker.getTypeOfSymbolAtLocation(target, decl), undefined, ts.TypeFormatFlags.NoTruncation)}`;
    else if (ts.isClassDeclaration(decl)) text = `class ${sym.name}`;
    else
      text = printer
        .printNode(ts.EmitHint.Unspecified, decl, decl.getSourceFile())
        .replace(/^export /, '')
        .replace(/\n\s*/g, ' ')
        .slice(0, 600);
    rows.push(`### \`${sym.name}\` (${kind.toLowerCase()})\n\n${doc ? `${doc}\n\n` : ''}\`\`\`ts\n${text}\n\`\`\``);
  }
  return `# API: \`${name}\`\n\nGenerated from the TSDoc and declarations of \`${file}\` by \`scripts/api-report.mjs\` (\`pnpm api\`); do not edit. ${exports.length} exports, ${values} of them runtime values.\n\n${rows.join('\n\n')}\n`;
}

if (process.argv[1] === fileURLToPath(import.meta.url)) {
  mkdirSync(`${root}docs/api`, { recursive: true });
  for (const [name, file] of ENTRIES) {
    const out = `docs/api/${name.replace(/^@hexsalvage\//, '').replace('/', '-')}.md`;
    writeFileSync(`${root}${out}`, apiReport(name, file));
    console.log(`wrote ${out}`);
  }
}
