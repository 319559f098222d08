import { mkdirSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { BROWSER_AVAILABLE, launchChromium, skipBrowserTests } from '../support/browser.js';
import { ROOT, runBin } from '../support/cli.js';

// The review report opened in a real headless browser: Debian's chromium driven by playwright-core.
// CI installs chromium (.ci/run), so there the test must run; elsewhere it may skip, saying why.
const skip = skipBrowserTests('reportBrowser');

describe.skipIf(skip)('report in a headless browser', () => {
  it('opens without console errors or network requests, every SVG has a box, and a screenshot is saved', async () => {
    expect(BROWSER_AVAILABLE).toBe(true);
    const artefacts = join(ROOT, 'test-artifacts');
    mkdirSync(artefacts, { recursive: true });
    const html = join(artefacts, 'review.html');
    const r = runBin([
      'report',
      '--topology',
      'anpc-hybrid',
      '--fault',
      'a.innerUpper',
      '--load-angle',
      '25',
      '--polarity-margin',
      '3',
      '--claims',
      'examples/pump-claims.json',
      '--out',
      html,
    ]);
    expect(r.code).toBe(0);
    const browser = await launchChromium();
    try {
      const page = await browser.newPage({ viewport: { width: 1000, height: 1400 } });
      const errors: string[] = [];
      const requests: string[] = [];
      page.on('console', (m) => {
        if (m.type() === 'error') errors.push(m.text());
      });
      page.on('pageerror', (e) => errors.push(String(e)));
      page.on('request', (q) => requests.push(q.url()));
      await page.goto(`file://${html}`, { waitUntil: 'load' });
      const boxes = await page.$$eval('svg', (svgs) =>
        svgs.map((s) => {
          const b = s.getBoundingClientRect();
          return [b.width, b.height];
        }),
      );
      expect(boxes.length).toBeGreaterThanOrEqual(5);
      for (const [w, h] of boxes) {
        expect(w).toBeGreaterThan(50);
        expect(h).toBeGreaterThan(50);
      }
      expect(errors).toEqual([]);
      expect(requests.filter((u) => u !== `file://${html}`)).toEqual([]);
      await page.screenshot({ path: join(artefacts, 'review.png'), fullPage: true });
      await page.emulateMedia({ media: 'print' });
      const pdf = await page.pdf({ format: 'A4', printBackground: true });
      expect(pdf.length).toBeGreaterThan(10000);
      // A4 less the page margins (210 − 2·14 mm = 182 mm ≈ 688 px at 96 px/in): every table,
      // the claims table with its "short by" column included, lies within the printable width
      await page.setViewportSize({ width: 688, height: 1000 });
      const tables = await page.$$eval('table', (ts) => ts.map((t) => [t.className, t.getBoundingClientRect().right, t.scrollWidth, t.clientWidth] as const));
      expect(tables.some(([c]) => c === 'claims')).toBe(true);
      for (const [c, right, scroll, client] of tables) {
        expect(right, `table ${c}`).toBeLessThanOrEqual(688 + 0.5);
        expect(scroll, `table ${c}`).toBeLessThanOrEqual(client + 1);
      }
      const last = await page.$eval('table.claims thead th:last-child', (th) => th.getBoundingClientRect().right);
      expect(last).toBeLessThanOrEqual(688 + 0.5);
    } finally {
      await browser.close();
    }
  });
});
