import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { startHarness, watchedPage, type Harness } from './harness.js';

let h: Harness;
beforeAll(async () => { h = await startHarness(); });
afterAll(async () => { await h?.close(); });

const rows = (page: Page) => page.locator('#ranges gw-ranges tbody tr');
const caption = (page: Page) => page.locator('#ranges gw-ranges caption').innerText();

async function twoRangeDemo(page: Page) {
  await page.goto(h.url);
  await expect.poll(() => page.locator('gw-parts').first().locator('tbody').innerText()).toMatch(/R1/);
  await page.selectOption('select[aria-label="Load a demo"]', 'two-range-clamp');
  await expect.poll(() => rows(page).count()).toBe(2);
}

describe('the range switch in Chromium (issue 19)', () => {
  it('the two-range demo shows both ranges, the switch in the schematic and the parts list, verdicts and calibration by range', async () => {
    const { page, errors } = await watchedPage(h);
    await twoRangeDemo(page);
    expect(await caption(page)).toMatch(/two poles/);
    expect(await rows(page).nth(1).innerText()).toMatch(/40\.0 mV\/A/);
    expect(await rows(page).nth(1).innerText()).toMatch(/4\.500 V/);
    expect(await page.locator('gw-schematic').first().locator('svg').innerHTML()).toMatch(/SW1a/);
    const parts = await page.locator('gw-parts').first().locator('tbody').innerText();
    expect(parts).toMatch(/SW1/);
    expect(parts).toMatch(/2-pole 2-way switch/);
    expect(parts).toMatch(/\(range 2\)/);
    await expect.poll(() => page.locator('gw-verdicts ul').first().innerText()).toMatch(/Range 2 \(40\.0 mV\/A\): /);
    expect(await page.locator('ol.cal').innerText()).toMatch(/Range 2 \(40\.0 mV\/A\): set SW1 to position 2/);
    // The printed sheet lists each range too.
    expect(await page.locator('gw-build-sheet gw-ranges tbody tr').count()).toBe(2);
    expect(errors).toEqual([]);
    await page.context().close();
  });

  it('choosing one pole moves the zero on range 2 and says so; each position downloads its own netlist', async () => {
    const { page, errors } = await watchedPage(h);
    await twoRangeDemo(page);
    await page.locator('gw-editor select[data-path="target.rangeSwitch"]').selectOption({ label: 'One pole: feedback only (zero moves)' });
    await expect.poll(() => caption(page)).toMatch(/one pole/);
    expect(await rows(page).nth(1).innerText()).toMatch(/2\.990 V \(-1\.51 V\)/);
    expect(await page.locator('[data-code="range-zero-shift"]').innerText()).toMatch(/On range 2/);
    const [download] = await Promise.all([page.waitForEvent('download'), rows(page).nth(1).locator('button').click()]);
    expect(download.suggestedFilename()).toMatch(/-range-2\.cir$/);
    const text = await (await download.createReadStream())!.toArray().then((c) => Buffer.concat(c).toString('utf8'));
    expect(text).toMatch(/Range switch SW1 \(one pole\) at position 2 of 2/);
    expect(errors).toEqual([]);
    await page.context().close();
  });

  it('the editor adds a second range to a design and takes it away again', async () => {
    const { page, errors } = await watchedPage(h);
    await page.goto(h.url);
    await expect.poll(() => page.locator('gw-parts').first().locator('tbody').innerText()).toMatch(/R1/);
    await page.locator('gw-editor input[data-path="target.ranges"]').check();
    await expect.poll(() => rows(page).count()).toBe(2);
    await page.locator('gw-editor input[data-path="target.ranges"]').uncheck();
    await expect.poll(() => page.locator('#ranges').count()).toBe(0);
    expect(errors).toEqual([]);
    await page.context().close();
  });

  it('the editor takes the switch to a third and a fourth range, one after the other, and back', async () => {
    const { page, errors } = await watchedPage(h);
    await page.goto(h.url);
    await expect.poll(() => page.locator('gw-parts').first().locator('tbody').innerText()).toMatch(/R1/);
    // The third range's switch appears only once there is a second range.
    expect(await page.locator('gw-editor input[data-path="target.ranges.1"]').count()).toBe(0);
    await page.locator('gw-editor input[data-path="target.ranges"]').check();
    await expect.poll(() => rows(page).count()).toBe(2);
    await page.locator('gw-editor input[data-path="target.ranges.1"]').check();
    await expect.poll(() => rows(page).count()).toBe(3);
    await page.locator('gw-editor input[data-path="target.ranges.2"]').check();
    await expect.poll(() => rows(page).count()).toBe(4);
    expect(await page.locator('gw-editor input[data-path="target.ranges.3"]').count()).toBe(0);
    await page.locator('gw-editor input[data-path="target.ranges.2"]').uncheck();
    await expect.poll(() => rows(page).count()).toBe(3);
    expect(errors).toEqual([]);
    await page.context().close();
  });
});
