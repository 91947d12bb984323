/**
 * Issue 23 in Chromium: what the app loads on demand arrives and works when it is needed. The page starts with
 * one script; the panels every page shows are defined after the verdict without a person doing anything; the
 * trade when its panel is opened; the range switch when the design has one (or with the printed sheet); the
 * comparisons' core when a comparison is opened; the SPICE writer when asked for. Every wait is on a
 * condition, never on a time. Designs are the demo scenarios of our own invention.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import type { Page } from 'playwright-core';
import { startHarness, watchedPage, type Harness } from './harness.js';
import { comparisonRows } from '../../src/present/comparison.js';
import { demoDesign } from '../../src/model/demos.js';

/** Whether Chart.js has drawn the transfer plot: it can say where its first point lies. */
const transferDrawn = (page: Page) => page.locator('gw-chart[data-chart="transfer"]').evaluate((el: any) => el.pointPosition(0, 0) !== null).catch(() => false);

let h: Harness;
beforeAll(async () => { h = await startHarness(); });
afterAll(async () => { await h?.close(); });

const defined = (page: Page, tag: string) => page.evaluate((t) => customElements.get(t) !== undefined, tag);

/** Opens the app and records the scripts it fetches. */
async function openApp(h: Harness) {
  const w = await watchedPage(h);
  const scripts: string[] = [];
  w.page.on('request', (r) => { if (r.resourceType() === 'script') scripts.push(new URL(r.url()).pathname); });
  await w.page.goto(h.url);
  await w.page.locator('gw-verdicts li').first().waitFor();
  return { ...w, scripts };
}

describe('loading on demand (issue 23)', () => {
  it('the page as served names one script; the panels every page shows are defined after the verdict and drawn; the trade waits for its panel', async () => {
    // The built page (what `vite preview` serves): one module script, nothing preloaded beside it.
    const served = readFileSync('dist/index.html', 'utf8');
    expect([...served.matchAll(/<script\b[^>]*\bsrc=/g)]).toHaveLength(1);
    expect(served).not.toMatch(/modulepreload/);
    const { page, errors, offsite } = await openApp(h);
    for (const tag of ['gw-opamp-compare', 'gw-supply-options', 'gw-kit-editor', 'gw-bench', 'gw-trace', 'gw-build-sheet']) {
      await expect.poll(() => defined(page, tag), { message: tag }).toBe(true);
    }
    // Defined, and drawn with their properties from the app: the kit editor and the bench readings show controls.
    await expect.poll(() => page.locator('gw-kit-editor').evaluate((el) => el.shadowRoot?.querySelectorAll('button, textarea, input, select').length ?? 0)).toBeGreaterThan(0);
    await expect.poll(() => page.locator('gw-bench[mode="probe"]').evaluate((el) => el.shadowRoot?.querySelectorAll('textarea, input, button').length ?? 0)).toBeGreaterThan(0);
    // The trade panel is closed: its element is not loaded. (The range switch's element comes with the printed
    // sheet, which lists the ranges of a design that has them.)
    expect(await defined(page, 'gw-trade')).toBe(false);
    // Chart.js arrived after the first render and the transfer plot is drawn.
    await expect.poll(() => transferDrawn(page)).toBe(true);
    // The verdict is there once the plot is (a condition on the page, not on a clock).
    expect(await page.locator('gw-verdicts li').count()).toBeGreaterThan(0);
    // The second step completes the scope view and the spread plot.
    await expect.poll(() => page.locator('#scope').getAttribute('aria-busy')).toBe('false');
    expect(await page.locator('#scope gw-chart[data-chart="waveform"]').count()).toBe(1);
    expect(await page.locator('gw-chart[data-chart="spread"]').count()).toBe(1);
    expect(errors).toEqual([]);
    expect(offsite).toEqual([]);
    await page.context().close();
  });

  it('the op-amp comparison fetches its core when opened, and shows the core\'s rows', async () => {
    const { page, errors, scripts } = await openApp(h);
    await expect.poll(() => defined(page, 'gw-opamp-compare')).toBe(true);
    const before = scripts.length;
    await page.locator('gw-opamp-compare summary').click();
    const expected = comparisonRows(demoDesign()).map((r) => `${r.source}:${r.id}`);
    await expect.poll(() => page.locator('gw-opamp-compare tbody tr').evaluateAll((rows) => rows.map((r) => r.getAttribute('data-id')))).toEqual(expected);
    expect(scripts.length).toBeGreaterThan(before);
    expect(errors).toEqual([]);
    await page.context().close();
  });

  it('the trade loads when its panel is opened, the range switch when the design has one, and each works', async () => {
    const { page, errors } = await openApp(h);
    expect(await defined(page, 'gw-trade')).toBe(false);
    await page.locator('#trade summary').click();
    await expect.poll(() => defined(page, 'gw-trade')).toBe(true);
    await expect.poll(() => page.locator('#trade gw-trade tr[data-sweep]').count()).toBe(15);
    await page.selectOption('select[aria-label="Load a demo"]', 'two-range-clamp');
    await expect.poll(() => defined(page, 'gw-ranges')).toBe(true);
    await expect.poll(() => page.locator('#ranges gw-ranges tbody tr').count()).toBe(2);
    expect(errors).toEqual([]);
    await page.context().close();
  });

  it('the SPICE writer loads when the netlist is asked for, and the netlist carries the cautions', async () => {
    const { page, errors } = await openApp(h);
    const [download] = await Promise.all([page.waitForEvent('download'), page.getByRole('button', { name: 'SPICE netlist' }).click()]);
    expect(download.suggestedFilename()).toMatch(/\.cir$/);
    const text = await (await download.createReadStream())!.toArray().then((c) => Buffer.concat(c).toString('utf8'));
    expect(text).toMatch(/^\.end\s*$/m);
    expect(text).toMatch(/insulated/i);
    expect(errors).toEqual([]);
    await page.context().close();
  });

  it('the printed sheet shows the completed report of the design in force after an edit', async () => {
    const { page, errors } = await openApp(h);
    const f = page.locator('input[data-path="title"]');
    await f.fill('Sheet after an edit');
    await f.press('Enter');
    await page.emulateMedia({ media: 'print' });
    await expect.poll(() => page.locator('gw-build-sheet h1').innerText()).toBe('Sheet after an edit');
    await expect.poll(() => page.evaluate(() => document.querySelector('gw-app')!.shadowRoot!.querySelector('.sheet gw-trace')?.shadowRoot?.querySelectorAll('polyline').length ?? 0)).toBeGreaterThan(0);
    expect(errors).toEqual([]);
    await page.context().close();
  });

  it('a panel whose part cannot be fetched (the network gone) says so and keeps the design; after a reload it works', async () => {
    const { page, errors } = await openApp(h);
    await expect.poll(() => defined(page, 'gw-opamp-compare')).toBe(true);
    const title = await page.locator('input[data-path="title"]').inputValue();
    await page.context().setOffline(true);
    await page.locator('gw-opamp-compare summary').click();
    await expect.poll(() => page.locator('gw-opamp-compare .message').innerText()).toMatch(/could not be loaded/);
    expect(await page.locator('input[data-path="title"]').inputValue()).toBe(title);
    await page.context().setOffline(false);
    // The browser keeps a failed module fetch as failed until the page is loaded again, as the message says.
    await page.reload();
    await page.locator('gw-opamp-compare summary').click();
    await expect.poll(() => page.locator('gw-opamp-compare tbody tr').count()).toBeGreaterThan(0);
    expect(await page.locator('input[data-path="title"]').inputValue()).toBe(title);
    // The only errors are the failed fetches themselves.
    expect(errors.filter((e) => !/Failed to fetch|ERR_INTERNET_DISCONNECTED|Failed to load|dynamically imported module/i.test(e))).toEqual([]);
    await page.context().close();
  });

  it('a chart given data equal to what it drew does not update; a moved point does', async () => {
    const { page, errors } = await openApp(h);
    await expect.poll(() => transferDrawn(page)).toBe(true);
    const r = await page.locator('gw-chart[data-chart="transfer"]').evaluate(async (el: any) => {
      await el.updateComplete;
      el.data = structuredClone(el.data);
      const same = el.isUpdatePending;
      await el.updateComplete;
      const moved = structuredClone(el.data);
      moved.series[0].points[0].y += 0.001;
      el.data = moved;
      const changed = el.isUpdatePending;
      await el.updateComplete;
      return { same, changed };
    });
    expect(r).toEqual({ same: false, changed: true });
    expect(errors).toEqual([]);
    await page.context().close();
  });
});
