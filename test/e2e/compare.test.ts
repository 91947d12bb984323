/**
 * Op-amps side by side and supply choices in Chromium: the elements alone (accessible, empty by default,
 * events only on a person's input), then in the app against the core's own rows. Designs are the demo
 * scenarios of our own invention.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdirSync, mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { startHarness, watchedPage, type Harness } from './harness.js';
import { comparisonRows, supplyChoices } from '../../src/present/comparison.js';
import { demoDesign } from '../../src/model/demos.js';
import { archetype } from '../../src/model/opamps.js';
import { serialiseOpAmpList } from '../../src/model/opamp-list.js';

let h: Harness;
beforeAll(async () => { h = await startHarness(); });
afterAll(async () => { await h?.close(); });

const opampRows = (page: Page) => page.locator('gw-opamp-compare tbody tr');
const supplyRows = (page: Page) => page.locator('gw-supply-options tbody tr');
const rowIds = (page: Page) => opampRows(page).evaluateAll((rows) => rows.map((r) => r.getAttribute('data-id')));
const field = (page: Page, path: string) => page.locator(`input[data-path="${path}"]`);

async function openApp(h: Harness, opts: Parameters<typeof watchedPage>[1] = {}) {
  const w = await watchedPage(h, opts);
  await w.page.goto(h.url);
  await w.page.locator('gw-verdicts li').first().waitFor();
  // The two panels load after the first render (issue 23): wait until they are defined.
  await w.page.evaluate(() => Promise.all(['gw-opamp-compare', 'gw-supply-options'].map((t) => customElements.whenDefined(t))));
  return w;
}

describe('<gw-opamp-compare> and <gw-supply-options> alone', () => {
  it('start closed and empty, name their tables, and fire events only on a person\'s input', async () => {
    const { page } = await openApp(h);
    const r = await page.evaluate(async () => {
      const el = document.createElement('gw-opamp-compare') as HTMLElement & { rows: unknown; own: unknown[]; open: boolean; measurand: string; updateComplete: Promise<unknown> };
      const sup = document.createElement('gw-supply-options') as HTMLElement & { options: unknown; open: boolean; updateComplete: Promise<unknown> };
      const events: string[] = [];
      for (const name of ['gw-panel-toggle', 'gw-adopt-opamp', 'gw-own-opamps', 'gw-adopt-supply']) {
        el.addEventListener(name, (e) => events.push(`${name} ${JSON.stringify((e as CustomEvent).detail)}`));
        sup.addEventListener(name, (e) => events.push(`${name} ${JSON.stringify((e as CustomEvent).detail)}`));
      }
      document.body.append(el, sup);
      await el.updateComplete; await sup.updateComplete;
      const defaults = { rows: el.rows, own: el.own.length, open: el.open, options: sup.options, supOpen: sup.open };
      // Code opening the panels and setting rows fires nothing.
      el.open = true; sup.open = true; el.measurand = 'A';
      el.rows = [{ source: 'archetype', id: 'x', name: '<b>part</b>', opamp: { name: 'x' }, current: false, fits: false, misfits: [{ at: 'supply', side: 'high', cause: 'opamp-output' }], measurandLow: -1, measurandHigh: 1, endOfLifeLow: null, endOfLifeHigh: null, bandwidth: 1e3, fullPower: 1e3, noiseReferred: 1e-3, errorAfterTrim: 0.01, supplyCurrent: 1e-3, batteryLife: null, hoursToClip: null, verdict: 'fail', findings: [] }];
      sup.options = [];
      await el.updateComplete; await sup.updateComplete;
      const afterCode = events.length;
      const table = el.shadowRoot!.querySelector('table')!.getAttribute('aria-label');
      const bold = el.shadowRoot!.querySelectorAll('b').length;
      const fitsText = el.shadowRoot!.querySelector('tbody td')!.textContent!.replace(/\s+/g, ' ').trim();
      const noBattery = sup.shadowRoot!.querySelector('details p')!.textContent;
      (el.shadowRoot!.querySelector('tbody button') as HTMLButtonElement).click();
      (el.shadowRoot!.querySelector('.own button') as HTMLButtonElement).click();
      (el.shadowRoot!.querySelector('summary') as HTMLElement).click();
      await new Promise((res) => el.shadowRoot!.querySelector('details')!.addEventListener('toggle', res, { once: true }));
      el.remove(); sup.remove();
      return { defaults, afterCode, table, bold, fitsText, noBattery, events };
    });
    expect(r.defaults).toEqual({ rows: null, own: 0, open: false, options: null, supOpen: false });
    expect(r.afterCode).toBe(0);
    expect(r.table).toBe('Op-amps side by side');
    expect(r.bold).toBe(0);
    expect(r.fitsText).toMatch(/^No\s*high end: output swing$/);
    expect(r.noBattery).toMatch(/bench supply/);
    expect(r.events).toEqual(['gw-adopt-opamp {"opamp":{"name":"x"}}', 'gw-own-opamps {"action":"keep"}', 'gw-panel-toggle {"panel":"opamps","open":false}']);
    await page.context().close();
  });
});

describe('the comparisons in the app', () => {
  it('shows the core\'s rows for the demo in the core\'s order, and "Use" makes that op-amp the design\'s', async () => {
    // A wide window, so that the screenshot for the README holds every column.
    const { page, errors } = await openApp(h, { viewport: { width: 1760, height: 1000 } });
    await page.locator('gw-opamp-compare summary').click();
    const expected = comparisonRows(demoDesign()).map((r) => `${r.source}:${r.id}`);
    await expect.poll(() => rowIds(page)).toEqual(expected);
    // The demo's 9 V battery ends at 6.0 V: the general-purpose part's output stops at 4.5 V, the zero, there.
    expect(await page.locator('gw-opamp-compare tr[data-id="archetype:bipolar-general"]').getAttribute('class')).toBe('current');
    expect(await page.locator('gw-opamp-compare tr[data-id="archetype:bipolar-general"] td').first().innerText()).toMatch(/high end: output swing at end of battery life/);
    mkdirSync('docs', { recursive: true });
    await page.locator('#compare-opamps').screenshot({ path: 'docs/screenshot-compare.png' });
    await page.locator('gw-opamp-compare tr[data-id="archetype:cmos-rail-to-rail"] button').click();
    await expect.poll(() => page.locator('gw-opamp-compare tr.current').getAttribute('data-id')).toBe('archetype:cmos-rail-to-rail');
    expect(await field(page, 'opamp.outputHigh').inputValue()).toBe('0.02 V');
    expect(errors).toEqual([]);
    await page.context().close();
  });

  it('keeps the design\'s op-amp in the person\'s list over a reload, adds it as a row, and removes it', async () => {
    const { page, errors } = await openApp(h);
    await page.locator('gw-opamp-compare summary').click();
    await expect.poll(() => opampRows(page).count()).toBeGreaterThan(0);
    await page.locator('gw-opamp-compare .own button', { hasText: 'Keep the design' }).click();
    await expect.poll(() => rowIds(page)).toContain('own:0');
    await page.reload();
    await page.locator('gw-opamp-compare summary').click();
    await expect.poll(() => rowIds(page)).toContain('own:0');
    expect(await page.locator('gw-opamp-compare ul[aria-label="My op-amps"] li').count()).toBe(1);
    await page.locator('gw-opamp-compare li button').click();
    await expect.poll(() => rowIds(page)).not.toContain('own:0');
    expect(errors).toEqual([]);
    await page.context().close();
  });

  it('opens an op-amps file (its rows appear), refuses a bad one by the field\'s label, and saves the list as a file', async () => {
    const { page, errors } = await openApp(h);
    const dir = mkdtempSync(join(tmpdir(), 'gw-opamps-'));
    // Op-amps of a person's own (scenarios of our own), one named with markup that must stay text.
    const good = join(dir, 'mine.json');
    writeFileSync(good, serialiseOpAmpList([{ ...archetype('cmos-rail-to-rail')!.spec, name: '<img src=x onerror=alert(1)> drawer part', gbw: 3e5 }]));
    const bad = join(dir, 'bad.json');
    writeFileSync(bad, JSON.stringify({ format: 'gainwright-opamps', version: 1, opamps: [{ ...archetype('cmos-rail-to-rail')!.spec, gbw: -1 }] }));
    await page.locator('gw-opamp-compare summary').click();
    await page.locator('gw-opamp-compare input[type=file]').setInputFiles(bad);
    await expect.poll(() => page.locator('gw-opamp-compare .message').innerText()).toMatch(/bad\.json is not an op-amp list.*op-amp 1: Gain-bandwidth \(GBW\) must be at least 1 Hz/);
    await page.locator('gw-opamp-compare input[type=file]').setInputFiles(good);
    await expect.poll(() => page.locator('gw-opamp-compare tr[data-id="own:0"] th').innerText()).toMatch(/<img src=x onerror=alert\(1\)> drawer part/);
    expect(await page.locator('gw-opamp-compare img').count()).toBe(0);
    const download = page.waitForEvent('download');
    await page.locator('gw-opamp-compare .own button', { hasText: 'Save my op-amps' }).click();
    const saved = await (await download).path();
    const { readFileSync } = await import('node:fs');
    expect(JSON.parse(readFileSync(saved!, 'utf8')).opamps[0].gbw).toBe(3e5);
    expect(errors).toEqual([]);
    await page.context().close();
  });

  it('lists the supply choices for the battery demo and "Use" on split rails sets the rails and the zero', async () => {
    const { page, errors } = await openApp(h);
    await page.locator('gw-supply-options summary').click();
    const expected = supplyChoices(demoDesign()).map((o) => o.kind);
    await expect.poll(() => supplyRows(page).evaluateAll((rows) => rows.map((r) => r.getAttribute('data-kind')))).toEqual(expected);
    await page.locator('gw-supply-options tr[data-kind="split"] button').click();
    await expect.poll(() => field(page, 'supply.negative').inputValue()).toBe('-4.5 V');
    expect(await field(page, 'target.zero').inputValue()).toBe('0 V');
    await expect.poll(() => page.locator('gw-supply-options tr.current').getAttribute('data-kind')).toBe('as-is');
    expect(await supplyRows(page).evaluateAll((rows) => rows.map((r) => r.getAttribute('data-kind')))).not.toContain('split');
    expect(errors).toEqual([]);
    await page.context().close();
  });
});
