/**
 * The resistor kit in Chromium: switching it on, pasting a list, and what the report says when the kit
 * falls short. Series membership from IEC 60063 (published); kits and designs are scenarios of our own.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { fixedParts, kitOf, startHarness, watchedPage, type Harness } from './harness.js';
import { isMember } from '../../src/model/eseries.js';

let h: Harness;
beforeAll(async () => { h = await startHarness(); });
afterAll(async () => { await h?.close(); });


describe('<gw-kit-editor> in the app', () => {
  it('switched on, the design takes every fixed resistor from an E12 kit; switched off, the kit goes', async () => {
    const { page, errors } = await watchedPage(h);
    await page.goto(h.url);
    await page.locator('gw-verdicts li').first().waitFor();
    await page.locator('gw-kit-editor input[type=checkbox]').check();
    await expect.poll(() => kitOf(page)).toMatchObject({ series: 'E12', min: 10, max: 1e6 });
    const parts = await fixedParts(page);
    expect(parts.length).toBeGreaterThan(1);
    for (const ohms of parts) expect(isMember(ohms, 'E12')).toBe(true);
    await page.locator('gw-kit-editor input[type=checkbox]').uncheck();
    await expect.poll(() => kitOf(page)).toBeNull();
    expect(errors).toEqual([]);
    await page.context().close();
  });

  it('a pasted list that falls short gets the kit finding with the value to buy, and unreadable pieces are named', async () => {
    const { page, errors } = await watchedPage(h);
    await page.goto(h.url);
    await page.locator('gw-verdicts li').first().waitFor();
    await page.locator('gw-kit-editor input[type=checkbox]').check();
    await expect.poll(() => kitOf(page)).not.toBeNull();
    await page.locator('gw-kit-editor select').selectOption('list');
    await page.locator('gw-kit-editor textarea').fill('10k, 47k, banana');
    await page.locator('gw-kit-editor button', { hasText: 'Use these values' }).click();
    // Only the listed values: the series is gone from the kit.
    await expect.poll(() => kitOf(page)).toEqual({ min: 10, max: 1e6, parts: [{ ohms: 1e4 }, { ohms: 4.7e4 }] });
    expect(await page.locator('gw-kit-editor [role=alert]').innerText()).toMatch(/"banana" is not a resistance/);
    await expect.poll(() => page.locator('li[data-code="kit-short"]').innerText()).toMatch(/From the kit the nearest network is .* Buy .*\(E24\)/);
    expect(errors).toEqual([]);
    await page.context().close();
  });
});
