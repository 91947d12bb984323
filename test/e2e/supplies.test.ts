/**
 * The supply panel's new rows in Chromium (issue 18, part 3): the whole front end on a regulator, a zero for
 * the end of battery life and a rail-to-rail output op-amp beside the supplies, against the core's own rows;
 * adopting the zero is one edit, and Undo takes it back. The design is the bench clamp demo, a scenario of our
 * own invention.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { startHarness, watchedPage, type Harness } from './harness.js';
import { supplyChoices } from '../../src/present/comparison.js';
import { demoDesign } from '../../src/model/demos.js';

let h: Harness;
beforeAll(async () => { h = await startHarness(); });
afterAll(async () => { await h?.close(); });

const kinds = (page: Page) => page.locator('gw-supply-options tbody tr').evaluateAll((rows) => rows.map((r) => r.getAttribute('data-kind')));
const design = (page: Page) => page.evaluate(() => JSON.parse(JSON.stringify((document.querySelector('gw-app') as unknown as { currentDesign: unknown }).currentDesign)));

describe('the supply choices that buy back range', () => {
  it('shows the core\'s rows with their notes, marks the ones that gain range at end of life, and adopts the zero as one edit that Undo reverses', async () => {
    const { page, errors } = await watchedPage(h);
    await page.goto(h.url);
    await page.locator('gw-verdicts li').first().waitFor();
    const before = await design(page);
    const expected = supplyChoices(demoDesign());
    await page.locator('gw-supply-options summary').click();
    await expect.poll(() => kinds(page)).toEqual(expected.map((o) => o.kind));
    expect(expected.map((o) => o.kind)).toEqual(expect.arrayContaining(['zero', 'rail-to-rail', 'front-end-regulated']));
    // The demo's general-purpose op-amp loses the top of the range as its 9 V battery sags to 6 V: a lower
    // zero and a rail-to-rail output each buy some back, and are marked so.
    for (const kind of ['zero', 'rail-to-rail']) {
      expect(await page.locator(`gw-supply-options tr[data-kind="${kind}"]`).getAttribute('class')).toBe(expected.find((o) => o.kind === kind)!.gainsAtEndOfLife ? 'gains' : '');
    }
    expect(await page.locator('gw-supply-options tr[data-kind="zero"]').getAttribute('class')).toBe('gains');
    expect(await page.locator('gw-supply-options li[data-note="supply-zero-centred"]').innerText()).toMatch(/instead of 4\.50 V/);
    expect(await page.locator('gw-supply-options li[data-note="supply-front-end-regulated"]').innerText()).toMatch(/The battery is spent at 6\.00 V/);
    expect(await page.locator('gw-supply-options tr[data-kind="front-end-regulated"]').innerText()).toMatch(/all from the regulator/);

    const zero = expected.find((o) => o.kind === 'zero')!.zero;
    await page.locator('gw-supply-options tr[data-kind="zero"] button').click();
    await expect.poll(async () => (await design(page)).target.zero).toBeCloseTo(zero, 9);
    // One edit: only the zero changed.
    const after = await design(page);
    expect({ ...after, target: { ...after.target, zero: before.target.zero } }).toEqual(before);
    expect(await page.locator('input[data-path="target.zero"]').inputValue()).not.toBe('4.5 V');
    await page.locator('[data-notice="message"] button', { hasText: 'Undo' }).click();
    await expect.poll(() => design(page)).toEqual(before);
    expect(await page.locator('input[data-path="target.zero"]').inputValue()).toBe('4.5 V');
    expect(errors).toEqual([]);
    await page.context().close();
  });

  it('"Use" on the rail-to-rail row puts that op-amp in the design, and on the regulated front end sets the 5 V rail', async () => {
    const { page, errors } = await watchedPage(h);
    await page.goto(h.url);
    await page.locator('gw-verdicts li').first().waitFor();
    const expected = supplyChoices(demoDesign());
    await page.locator('gw-supply-options summary').click();
    await expect.poll(() => kinds(page)).toEqual(expected.map((o) => o.kind));
    await page.locator('gw-supply-options tr[data-kind="rail-to-rail"] button').click();
    await expect.poll(async () => (await design(page)).opamp.name).toBe(expected.find((o) => o.kind === 'rail-to-rail')!.opamp!.name);
    // The rows follow the new design: its op-amp is rail-to-rail now, so that row is gone.
    await expect.poll(() => kinds(page)).not.toContain('rail-to-rail');
    await page.locator('gw-supply-options tr[data-kind="front-end-regulated"] button').click();
    await expect.poll(async () => (await design(page)).supply.battery.rails).toBe('regulated');
    const d = await design(page);
    expect([d.supply.positive, d.supply.negative, d.supply.regulated.voltage]).toEqual([5, 0, 5]);
    expect(errors).toEqual([]);
    await page.context().close();
  });
});
