import { existsSync, readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { HexsalvageInputError, parseFailures } from '@hexsalvage/core';
import { resolveTopology } from '@hexsalvage/core/internal';
import { usage } from '../inputs/args.js';
import { HELP_OPTION, type Command } from '../command.js';
import { explorerPage } from '../explorer/explorerPage.js';
import { loadTopology } from '../inputs/loadTopology.js';
import { writeFileAtomic } from '../output/output.js';
import { TOOL_VERSION } from '../toolVersion.js';

const BUNDLE = fileURLToPath(new URL('../bundle/explorer.js', import.meta.url));

/** `hexsalvage explore`: the explorer page, one self-contained HTML file. */
export const exploreCommand: Command = {
  name: 'explore',
  summary: 'write the explorer page: fail elements with a click and see the limit, vectors, derating and remedies at once',
  usage: 'explore --out FILE.html [--topology T] [--fault F]...',
  options: [
    {
      name: 'topology',
      type: 'string',
      value: 'T',
      help: 'leg shown first: a built-in leg (default npc) or a netlist .json file (the page also opens files itself)',
    },
    { name: 'fault', type: 'list', value: 'F', help: 'element failed at the start, PHASE.DEVICE[:open|short]; repeatable' },
    { name: 'out', type: 'string', value: 'FILE', help: 'output .html file (replaced atomically); open it from disk, it needs no server and no network' },
    HELP_OPTION,
  ],
  run: async (args, io) => {
    const out = args.values.get('out');
    if (typeof out !== 'string' || !out.endsWith('.html')) throw usage('--out', 'a file name ending in .html', out);
    const given = (args.values.get('topology') as string | undefined) ?? 'npc';
    const topology = loadTopology(given);
    const faults = args.lists.get('fault') ?? [];
    for (const f of faults) if (f.includes('|')) throw usage('--fault', 'one element per fault here (the page sets ambiguous diagnoses with its toggles)', f);
    const leg = typeof topology === 'string' ? undefined : topology;
    parseFailures(faults, resolveTopology(topology));
    if (!existsSync(BUNDLE))
      throw new HexsalvageInputError(
        'usage',
        'explore',
        '(installation)',
        'the explorer script built by `pnpm build` (packages/cli/dist/bundle/explorer.js is missing)',
      );
    const html = explorerPage(readFileSync(BUNDLE, 'utf8'), {
      version: TOOL_VERSION,
      topology: typeof topology === 'string' ? topology : 'npc',
      ...(leg ? { netlist: leg, netlistFile: { name: given, text: readFileSync(given, 'utf8') } } : {}),
      faults,
    });
    await writeFileAtomic(out, html);
    await io.stdout(`wrote ${out} (explorer page, ${Buffer.byteLength(html)} bytes; open it in a browser)\n`);
    return 0;
  },
};
