/**
 * The closed-loop Hall sensor in the app (Chromium through playwright-core): chosen as the sensor model, its
 * fields edit the design, and the parts list, figures, findings and cautions carry the loop.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { startHarness, watchedPage, type Harness } from './harness.js';

let h: Harness;
beforeAll(async () => { h = await startHarness(); });
afterAll(async () => { await h?.close(); });

const partsText = (page: Page) => page.locator('gw-parts').first().locator('tbody').innerText();
const allText = (page: Page) => page.evaluate(() => {
  const text: string[] = [];
  const walk = (root: Document | ShadowRoot) => { for (const el of root.querySelectorAll('*')) { if (el.shadowRoot) walk(el.shadowRoot); } text.push((root as Document).body ? (root as Document).body.innerText : (root as ShadowRoot).textContent ?? ''); };
  walk(document);
  return text.join('\n');
});

describe('closed-loop Hall sensor in the app', () => {
  it('is chosen as the sensor model, shows its winding in the parts and its figures, and its turns edit the design', async () => {
    const { page, errors } = await watchedPage(h);
    await page.goto(h.url);
    await expect.poll(() => partsText(page)).toMatch(/R1/);
    await page.selectOption('select[data-path="sensor.type"]', 'closed-loop-hall');
    await expect.poll(() => partsText(page)).toMatch(/W1/);
    expect(await partsText(page)).toMatch(/1000 turns/);
    await expect.poll(() => allText(page)).toMatch(/Largest current held at zero flux/);
    expect(await allText(page)).toMatch(/compensation winding/i);
    // The turns trade, with its proposal marked.
    expect(await page.locator('#turns-trade table').innerText()).toMatch(/\(proposed\)/);
    // Twice the turns: the sensitivity at R_M halves (Ampère: N_p·I_p = N_s·I_s).
    const turns = page.locator('input[data-path="sensor.compensationTurns"]');
    await turns.fill('2000');
    await turns.press('Enter');
    await turns.blur();
    await expect.poll(() => partsText(page)).toMatch(/2000 turns/);
    await expect.poll(() => allText(page)).toMatch(/41\.0 mV\/A/);
    expect(await allText(page)).not.toMatch(/NaN|Infinity/);
    await page.locator('gw-schematic').first().screenshot({ path: 'docs/screenshot-closed-loop.png' });
    expect(errors).toEqual([]);
    await page.context().close();
  });
});
