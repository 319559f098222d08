// The explorer page in Chromium (`pnpm bench`): how long a change takes to show its result and its
// pictures, per leg, measured by the page itself (performance.now() around the update). Goals
// (issue "explorer page"): result ≤ 50 ms, pictures ≤ 100 ms, page < 2 MB. Printed, never asserted.
import { execFileSync } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { medianOf } from './timing.mjs';

const CHROMIUM = process.env.HEXSALVAGE_CHROMIUM ?? '/usr/bin/chromium';
const root = fileURLToPath(new URL('..', import.meta.url));
if (!existsSync(CHROMIUM)) {
  console.log(`explorer: no browser at ${CHROMIUM}, figures skipped`);
  process.exit(0);
}
const dir = mkdtempSync(join(tmpdir(), 'hs-bench-explorer-'));
try {
  const html = join(dir, 'explorer.html');
  execFileSync(process.execPath, [join(root, 'packages/cli/bin/hexsalvage.mjs'), 'explore', '--out', html]);
  const { chromium } = await import('playwright-core');
  const browser = await chromium.launch({ executablePath: CHROMIUM, args: ['--no-sandbox', '--disable-gpu'] });
  const page = await browser.newPage({ viewport: { width: 1280, height: 800 } });
  await page.goto(`file://${html}`);
  await page.waitForSelector('body[data-ready]');
  const sample = async () => {
    await page.waitForFunction(() => !document.body.dataset.pending);
    return page.evaluate(() => [Number(document.body.dataset.resultMs), Number(document.body.dataset.picturesMs)]);
  };
  const legs = [
    ['npc', null, ['a.outerUpper', 'a.outerUpper', 'a.clampUpper', 'b.innerLower', 'b.innerLower.diode']],
    ['anpc-hybrid', null, ['a.innerUpper', 'a.innerUpper', 'c.clampLower', 'b.outerUpper', 'b.outerUpper']],
    ['five-level', join(root, 'examples/five-level-leg.json'), ['a.s1', 'a.s1', 'b.s6', 'c.dA2', 'b.s6']],
  ];
  console.log(`explorer page: ${(statSync(html).size / 1024).toFixed(0)} KiB (goal < 2048 KiB)`);
  for (const [name, file, clicks] of legs) {
    if (file) {
      await page.setInputFiles('input[name="netlist"]', file);
      await page.waitForFunction(() => document.querySelector('select[name="topology"]').value.startsWith('file:'));
    } else await page.selectOption('select[name="topology"]', name);
    await sample();
    const result = [];
    const pictures = [];
    for (const d of clicks) {
      await page.click(`[data-device="${d}"]`);
      const [r, p] = await sample();
      result.push(r);
      pictures.push(p);
    }
    for (let v = 5; v <= 45; v += 5) {
      await page.fill('input[name="load-angle-slider"]', String(v));
      const [r, p] = await sample();
      result.push(r);
      pictures.push(p);
    }
    console.log(
      `  explorer ${name.padEnd(12)} ${result.length} changes: result median ${medianOf(result).toFixed(1)} ms, max ${Math.max(...result).toFixed(1)} ms (goal ≤ 50); pictures median ${medianOf(pictures).toFixed(1)} ms, max ${Math.max(...pictures).toFixed(1)} ms (goal ≤ 100)`,
    );
  }
  await browser.close();
} finally {
  rmSync(dir, { recursive: true, force: true });
}
