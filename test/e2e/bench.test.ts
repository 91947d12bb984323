import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import type { Page } from 'playwright-core';
import { startHarness, watchedPage, type Harness } from './harness.js';

let h: Harness;
beforeAll(async () => { h = await startHarness(); });
afterAll(async () => { await h?.close(); });

const sensorPanel = (page: Page) => page.locator('#sensor-readings');
const probePanel = (page: Page) => page.locator('#probe-readings');
const verdictText = (page: Page) => page.locator('gw-verdicts ul').first().innerText();
const partsText = (page: Page) => page.locator('gw-parts').first().locator('tbody').innerText();

describe('the bench loop in Chromium', () => {
  it('sensor readings pasted from a spreadsheet are fitted, flagged, plotted, and once in use they set the sensitivity', async () => {
    const { page, errors } = await watchedPage(h);
    await page.goto(h.url);
    await expect.poll(() => partsText(page)).toMatch(/R1/);
    const panel = sensorPanel(page);
    // Our own invented readings (docs/examples/sensor-readings.csv): semicolons, decimal commas, a header and a unit row.
    await panel.locator('summary').click();
    await panel.locator('textarea').fill(readFileSync('docs/examples/sensor-readings.csv', 'utf8'));
    await panel.locator('button[data-action="paste"]').click();
    await expect.poll(() => panel.locator('gw-readings tbody tr').count()).toBe(17);
    await expect.poll(() => panel.locator('ul.fit').innerText()).toMatch(/Sensitivity 22\.6\d mV\/A/);
    const fitText = await panel.locator('ul.fit').innerText();
    expect(fitText).toMatch(/Linear from -30\.00 A/);
    expect(fitText).toMatch(/outlier/);
    expect(fitText).toMatch(/fringing factor of 1\.1/);
    expect(await panel.locator('gw-readings tbody').innerText()).toMatch(/outlier/);
    expect(await panel.locator('gw-chart[data-chart="residuals"]').count()).toBe(1);
    const parts0 = await partsText(page);
    await panel.locator('input[data-path="sensor.readings.use"]').check();
    await expect.poll(() => partsText(page)).not.toBe(parts0);
    await expect.poll(() => panel.locator('ul.fit').innerText()).toMatch(/In use: sensitivity and zero from the readings/);
    // The readings are part of the design: a reload keeps them and their use.
    await page.reload();
    await expect.poll(() => sensorPanel(page).locator('gw-readings tbody tr').count()).toBe(17);
    expect(await sensorPanel(page).locator('input[data-path="sensor.readings.use"]').isChecked()).toBe(true);
    expect(errors).toEqual([]);
    await page.context().close();
  });

  it('readings of the built probe typed row by row give the trimmer settings, the order and the readings to expect', async () => {
    const { page, errors } = await watchedPage(h);
    await page.goto(h.url);
    await expect.poll(() => partsText(page)).toMatch(/RV1/);
    const panel = probePanel(page);
    const add = async (x: string, y: string) => {
      await panel.locator('input[data-new="x"]').fill(x);
      await panel.locator('input[data-new="y"]').fill(y);
      await panel.locator('input[data-new="y"]').press('Enter');
    };
    await add('0', '4,57');
    await expect.poll(() => panel.locator('ul.trim').innerText()).toMatch(/needs at least 2 different values/);
    await add('10', '5.58');
    await expect.poll(() => panel.locator('ul.trim').innerText()).toMatch(/Measured: scale 101\.0 mV\/A/);
    const text = await panel.locator('ul.trim').innerText();
    expect(text).toMatch(/1\. Turn RV\d/);
    expect(text).toMatch(/2\. Turn RV\d/);
    expect(text).toMatch(/the output should then read 4\.500 V/);
    // Readings taken after turning: say where RV1 sat, and the trim starts from there.
    await panel.locator('input[data-setting="RV1"]').fill('40');
    await panel.locator('input[data-setting="RV1"]').press('Enter');
    await expect.poll(() => panel.locator('ul.trim').innerText()).toMatch(/Turn RV1 \(gain trim\) from 40\.0 %/);
    // A row that is not a number is refused at the table, and the readings stay.
    await add('ten', '5');
    await expect.poll(() => panel.locator('gw-readings [role="alert"]').innerText()).toMatch(/not a number|two numbers/);
    expect(await panel.locator('gw-readings tbody tr').count()).toBe(3);
    // Removing a row brings back the message about what is missing.
    await panel.getByRole('button', { name: 'Remove reading 2' }).click();
    await expect.poll(() => panel.locator('ul.trim').innerText()).toMatch(/needs at least 2/);
    expect(errors).toEqual([]);
    await page.context().close();
  });

  it('text typed into the readings table stays inert', async () => {
    const { page, errors } = await watchedPage(h);
    await page.goto(h.url);
    await expect.poll(() => partsText(page)).toMatch(/R1/);
    const panel = probePanel(page);
    await panel.locator('summary').click();
    await panel.locator('textarea').fill('<img src=x onerror="window.__pwned=1">;1\n0;4.5\n');
    await panel.locator('button[data-action="paste"]').click();
    await expect.poll(() => panel.locator('gw-readings tbody tr').count()).toBe(2);
    expect(await page.evaluate(() => (window as unknown as { __pwned?: number }).__pwned)).toBeUndefined();
    expect(errors).toEqual([]);
    await page.context().close();
  });

  it('the printed sheet carries a blank table for the built probe\'s readings with the outputs to expect', async () => {
    const { page } = await watchedPage(h);
    await page.goto(h.url);
    await expect.poll(() => verdictText(page)).toMatch(/Covers the range|Clips/);
    await page.emulateMedia({ media: 'print' });
    const sheet = page.locator('.sheet');
    await expect.poll(() => sheet.isVisible()).toBe(true);
    const table = sheet.locator('gw-bench[mode="sheet"] table');
    const text = await table.innerText();
    expect(text).toMatch(/Read, as built/);
    // The demo's target: 4.5 V at zero, 100 mV/A: 5.5 V at 10 A and 6.5 V at 20 A.
    expect(text).toMatch(/4\.500 V/);
    expect(text).toMatch(/5\.500 V/);
    expect(text).toMatch(/6\.500 V/);
    expect(await table.locator('tbody tr').count()).toBe(4);
    await page.context().close();
  });
});
