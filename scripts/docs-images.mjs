// `pnpm docs:images`: renders every plot kind of a demo scenario to PNG in docs/images/.
import { execFileSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';

const root = fileURLToPath(new URL('..', import.meta.url));
const bin = fileURLToPath(new URL('../packages/cli/bin/hexsalvage.mjs', import.meta.url));
// Demo scenario (invented): a hybrid ANPC circulation-pump drive, SiC switch innerUpper of phase a open.
const scenario = ['--topology', 'anpc-hybrid', '--fault', 'a.innerUpper', '--load-angle', '25'];
/** Every picture of the documentation: plot kind, arguments, file. A test reads this list. */
export const jobs = [
  ['diagram', [...scenario, '--m', '0.5'], 'diagram.png'],
  ['sectors', scenario, 'sectors.png'],
  ['derating', [...scenario, '--compare', 'a.outerUpper.diode', '--compare', 'a.clampUpper'], 'derating.png'],
  ['leg', [...scenario, '--pattern', 'P', '--sign', '+'], 'leg.png'],
  ['sequence', scenario, 'sequence.png'],
];
// each picture as SVG (the source a test compares byte for byte with what the code draws now) and
// as PNG (what the documentation shows; rendered by Chromium)
if (process.argv[1] === fileURLToPath(import.meta.url)) for (const [kind, args, file] of jobs) {
  for (const name of [file.replace(/\.png$/, '.svg'), file]) {
    const out = execFileSync(process.execPath, [bin, 'plot', kind, ...args, '--out', `docs/images/${name}`], { cwd: root, encoding: 'utf8' });
    process.stdout.write(out);
  }
}
