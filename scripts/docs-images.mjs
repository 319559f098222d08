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
if (process.argv[1] === fileURLToPath(import.meta.url))
  for (const [kind, args, file] of jobs) {
    for (const name of [file.replace(/\.png$/, '.svg'), file]) {
      const out = execFileSync(process.execPath, [bin, 'plot', kind, ...args, '--out', `docs/images/${name}`], { cwd: root, encoding: 'utf8' });
      process.stdout.write(out);
    }
  }

// The explorer page at two screen sizes (review images; the browser test takes the same views):
// the demo scenario's leg with the failed switch, at its load angle.
if (process.argv[1] === fileURLToPath(import.meta.url)) {
  const chromiumPath = process.env.HEXSALVAGE_CHROMIUM ?? '/usr/bin/chromium';
  const { existsSync, mkdtempSync, rmSync } = await import('node:fs');
  const { tmpdir } = await import('node:os');
  const { join } = await import('node:path');
  if (!existsSync(chromiumPath)) console.log(`explorer screenshots skipped: no browser at ${chromiumPath}`);
  else {
    const dir = mkdtempSync(join(tmpdir(), 'hs-docs-explorer-'));
    try {
      const html = join(dir, 'explorer.html');
      execFileSync(process.execPath, [bin, 'explore', '--topology', 'anpc-hybrid', '--out', html], { cwd: root });
      const { chromium } = await import('playwright-core');
      const browser = await chromium.launch({ executablePath: chromiumPath, args: ['--no-sandbox', '--disable-gpu'] });
      const page = await browser.newPage({ viewport: { width: 1280, height: 800 } });
      await page.goto(`file://${html}`);
      await page.waitForSelector('body[data-ready]');
      await page.click('[data-device="a.innerUpper"]');
      await page.fill('input[name="load-angle"]', '25');
      await page.dispatchEvent('input[name="load-angle"]', 'change');
      await page.evaluate(() => document.activeElement?.blur());
      await page.waitForFunction(() => !document.body.dataset.pending);
      for (const [w, h] of [
        [1280, 800],
        [1920, 1080],
      ]) {
        await page.setViewportSize({ width: w, height: h });
        await page.screenshot({ path: join(root, `docs/images/explorer-${w}x${h}.png`) });
        console.log(`wrote docs/images/explorer-${w}x${h}.png`);
      }
      await browser.close();
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  }
}
