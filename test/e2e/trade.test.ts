import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { startHarness, watchedPage, type Harness } from './harness.js';

let h: Harness;
beforeAll(async () => { h = await startHarness(); });
afterAll(async () => { await h?.close(); });

const panel = (page: Page) => page.locator('#trade');
const ownTurns = (page: Page) => panel(page).locator('gw-trade tr.own[data-sweep="turns"]').getAttribute('data-turns');

describe('the turns trade in Chromium (issue 19)', () => {
  it('opens on the bench clamp with a plot per sweep and a row per build; a row\'s button adopts its turns', async () => {
    const { page, errors } = await watchedPage(h);
    await page.goto(h.url);
    await panel(page).locator('summary').click();
    // The bench-clamp demo: turns 1…10 at its gap, five gaps at its turns.
    await expect.poll(() => panel(page).locator('gw-trade tr[data-sweep]').count()).toBe(15);
    expect(await panel(page).locator('gw-chart[data-chart="trade-turns"]').count()).toBe(1);
    expect(await panel(page).locator('gw-chart[data-chart="trade-gap"]').count()).toBe(1);
    expect(await ownTurns(page)).toBe('1');
    // The printed sheet carries the trade once it is worked out: a table per sweep, the design's rows marked.
    await expect.poll(() => page.locator('gw-build-sheet section.trade table').count()).toBe(2);
    expect(await page.locator('gw-build-sheet section.trade tbody tr').count()).toBe(15);
    await panel(page).locator('gw-trade tr[data-sweep="turns"][data-turns="3"] button').click();
    await expect.poll(() => ownTurns(page)).toBe('3');
    await expect.poll(() => page.locator('[data-notice="message"]').innerText()).toMatch(/Now built with 3 turns and a 1\.50 mm gap/);
    // The design itself changed: its sensitivity in the figures is three times one turn's 20.5 mV/A.
    expect(await panel(page).locator('gw-trade tr.own[data-sweep="turns"]').innerText()).toMatch(/61\.6 mV\/A/);
    expect(errors).toEqual([]);
    await page.context().close();
  });

  it('a click on a plotted point adopts that build', async () => {
    const { page, errors } = await watchedPage(h);
    await page.goto(h.url);
    await panel(page).locator('summary').click();
    await expect.poll(() => panel(page).locator('gw-trade tr[data-sweep]').count()).toBe(15);
    const chart = panel(page).locator('gw-chart[data-chart="trade-turns"]');
    // Where Chart.js drew the fifth point (5 turns) of the first series, once it has drawn.
    let at: { x: number; y: number } | null = null;
    await expect.poll(async () => (at = await chart.evaluate((el: any) => el.pointPosition(0, 4)))).not.toBeNull();
    await chart.locator('canvas').click({ position: at! });
    await expect.poll(() => ownTurns(page)).toBe('5');
    expect(errors).toEqual([]);
    await page.context().close();
  });

  it('a current transformer trades its secondary turns and burden; giving its core shows the saturation current', async () => {
    const { page, errors } = await watchedPage(h);
    await page.goto(h.url);
    await expect.poll(() => page.locator('gw-parts').first().locator('tbody').innerText()).toMatch(/R1/);
    await page.selectOption('select[aria-label="Load a demo"]', 'appliance-ct');
    await panel(page).locator('summary').click();
    // The appliance CT demo: seven turn counts and seven burdens, the design's own in each.
    await expect.poll(() => panel(page).locator('gw-trade tr[data-sweep]').count()).toBe(14);
    expect(await panel(page).locator('gw-chart[data-chart="trade-burden"]').count()).toBe(1);
    expect(await panel(page).locator('gw-trade p.notes').last().innerText()).toMatch(/give the core's cross-section and saturation flux density/);
    await page.locator('gw-editor input[data-path="sensor.core"]').check();
    // The editor's default core (5 mm × 5 mm, 0.3 T), by hand with the transformer equation's √2·π = 4.443:
    // 4.443 × 50 Hz × 2000² × 25e-6 m² × 0.3 T / (33 + 60) Ω = 71.66 A rms, shown to three figures.
    await expect.poll(() => panel(page).locator('gw-trade tr.own[data-sweep="turns"]').innerText()).toMatch(/71\.7 A rms/);
    expect(errors).toEqual([]);
    await page.context().close();
  });

  it('a shunt design has no turns to trade and says so', async () => {
    const { page, errors } = await watchedPage(h);
    await page.goto(h.url);
    await panel(page).locator('summary').click();
    await expect.poll(() => panel(page).locator('gw-trade tr[data-sweep]').count()).toBe(15);
    await page.locator('gw-editor select[data-path="sensor.type"]').selectOption('shunt');
    await expect.poll(() => panel(page).locator('gw-trade p.notes').first().innerText()).toMatch(/Only a Hall sensor in a gapped core or a current transformer has turns to trade/);
    expect(errors).toEqual([]);
    await page.context().close();
  });
});
