import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdirSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { startHarness, watchedPage, type Harness } from './harness.js';
import { DEMOS } from '../../src/model/demos.js';

let h: Harness;
beforeAll(async () => { h = await startHarness(); });
afterAll(async () => { await h?.close(); });

const partsText = (page: Page) => page.locator('gw-parts').first().locator('tbody').innerText();
const verdictText = (page: Page) => page.locator('gw-verdicts ul').first().innerText();
const transferData = (page: Page) => page.evaluate(() => {
  const chart = document.querySelector('gw-app')!.shadowRoot!.querySelector('gw-chart[data-chart="transfer"]') as unknown as { data: { series: Array<{ points: Array<{ x: number; y: number }> }> } };
  return JSON.stringify(chart.data.series[0]!.points.slice(0, 5));
});
const field = (page: Page, path: string) => page.locator(`input[data-path="${path}"]`);

async function typeInto(page: Page, path: string, text: string): Promise<void> {
  const f = field(page, path);
  await f.fill(text);
  await f.press('Enter');
  await f.blur();
}

describe('the app in Chromium', () => {
  it('loads with the demo design and its verdict, without console errors or off-site requests', async () => {
    const { page, errors, offsite } = await watchedPage(h);
    await page.goto(h.url);
    await expect.poll(() => verdictText(page)).toMatch(/Covers the range|Clips/);
    expect(await page.locator('gw-verdicts li').count()).toBeGreaterThan(4);
    expect(await partsText(page)).toMatch(/R1/);
    expect(await page.locator('.safety-banner').innerText()).toMatch(/insulated conductors/);
    mkdirSync('docs', { recursive: true });
    await page.screenshot({ path: 'docs/screenshot-main.png' });
    expect(errors).toEqual([]);
    expect(offsite).toEqual([]);
    await page.context().close();
  });

  it('a new sensitivity changes the gain, the parts and the transfer plot', async () => {
    const { page, errors } = await watchedPage(h);
    await page.goto(h.url);
    await expect.poll(() => partsText(page)).toMatch(/R1/);
    const parts0 = await partsText(page);
    const plot0 = await transferData(page);
    const figures0 = await page.locator('gw-figures table').first().innerText();
    await typeInto(page, 'sensor.hallSensitivity', '31 mV/mT');
    await expect.poll(() => partsText(page)).not.toBe(parts0);
    expect(await transferData(page)).not.toBe(plot0);
    const figures1 = await page.locator('gw-figures table').first().innerText();
    expect(figures1).not.toBe(figures0);
    expect(await field(page, 'sensor.hallSensitivity').inputValue()).toBe('31 mV/mT');
    expect(errors).toEqual([]);
    await page.context().close();
  });

  it('a bad value shows a message at the field and the old results stay', async () => {
    const { page } = await watchedPage(h);
    await page.goto(h.url);
    await expect.poll(() => partsText(page)).toMatch(/R1/);
    const parts0 = await partsText(page);
    await typeInto(page, 'opamp.gbw', 'fast please');
    await expect.poll(() => page.locator('gw-field[path="opamp.gbw"] [role="alert"]').innerText()).toMatch(/cannot read "fast please"/);
    expect(await partsText(page)).toBe(parts0);
    await typeInto(page, 'opamp.gbw', '-3 MHz');
    await expect.poll(() => page.locator('gw-field[path="opamp.gbw"] [role="alert"]').innerText()).toMatch(/Gain-bandwidth \(GBW\) must be at least 1 Hz/);
    expect(await partsText(page)).toBe(parts0);
    expect(await page.locator('gw-chart').count()).toBeGreaterThan(3);
    await page.context().close();
  });

  it('save, then open the file again, gives the same parts', async () => {
    const { page } = await watchedPage(h);
    await page.goto(h.url);
    await expect.poll(() => partsText(page)).toMatch(/R1/);
    await typeInto(page, 'target.scale', '50 mV/A');
    await expect.poll(() => verdictText(page)).toMatch(/Scale 50/);
    const parts = await partsText(page);
    const [download] = await Promise.all([page.waitForEvent('download'), page.getByRole('button', { name: 'Save' }).click()]);
    const dir = mkdtempSync(join(tmpdir(), 'gw-e2e-'));
    const file = join(dir, 'saved.json');
    await download.saveAs(file);
    expect(JSON.parse(readFileSync(file, 'utf8')).target.scale).toBe(0.05);
    // Open it in a fresh page that starts from the demo.
    const fresh = await watchedPage(h);
    await fresh.page.goto(h.url);
    await fresh.page.locator('#open-file').setInputFiles(file);
    await expect.poll(() => partsText(fresh.page)).toBe(parts);
    await page.context().close();
    await fresh.page.context().close();
  });

  it('a reload finds the design still there', async () => {
    const { page } = await watchedPage(h);
    await page.goto(h.url);
    await typeInto(page, 'target.zero', '4 V');
    await expect.poll(() => verdictText(page)).toMatch(/zero 4\.00 V/);
    const parts = await partsText(page);
    await page.reload();
    await expect.poll(() => partsText(page)).toBe(parts);
    expect(await field(page, 'target.zero').inputValue()).toBe('4 V');
    await page.context().close();
  });

  it('the share link opens the same design in a fresh browser', async () => {
    const { page } = await watchedPage(h, { permissions: ['clipboard-read', 'clipboard-write'] });
    await page.goto(h.url);
    await typeInto(page, 'target.zero', '3.5 V');
    await expect.poll(() => verdictText(page)).toMatch(/zero 3\.50 V/);
    const parts = await partsText(page);
    await page.getByRole('button', { name: 'Share link' }).click();
    const link = await page.locator('input.share').inputValue();
    expect(link).toMatch(/#d=/);
    const other = await watchedPage(h);
    await other.page.goto(link);
    await expect.poll(() => partsText(other.page)).toBe(parts);
    expect(await field(other.page, 'target.zero').inputValue()).toBe('3.5 V');
    // An edit after opening the link survives a reload (the link does not win over the newer design).
    await typeInto(other.page, 'target.zero', '3.2 V');
    await expect.poll(() => verdictText(other.page)).toMatch(/zero 3\.20 V/);
    await other.page.reload();
    await expect.poll(() => field(other.page, 'target.zero').inputValue()).toBe('3.2 V');
    await page.context().close();
    await other.page.context().close();
  });

  it('the print view holds the parts list, the calibration steps and the cautions', async () => {
    const { page } = await watchedPage(h);
    await page.goto(h.url);
    await expect.poll(() => partsText(page)).toMatch(/R1/);
    await page.emulateMedia({ media: 'print' });
    const sheet = page.locator('gw-build-sheet table.page');
    await expect.poll(() => sheet.isVisible()).toBe(true);
    const text = await sheet.innerText();
    expect(text).toMatch(/Parts list/);
    expect(text).toMatch(/RV1/);
    expect(text).toMatch(/Calibration/);
    expect(text).toMatch(/Zero: /);
    expect(text).toMatch(/insulated conductors/);
    expect(text).toMatch(/measurement-category/);
    expect(await page.locator('main').isVisible()).toBe(false);
    await page.screenshot({ path: 'docs/screenshot-print.png', fullPage: true });
    await page.context().close();
  });

  it('a title with markup is shown as text and runs nothing', async () => {
    const { page, errors } = await watchedPage(h);
    await page.goto(h.url);
    await page.evaluate(() => { (window as unknown as { __pwned: boolean }).__pwned = false; });
    const title = field(page, 'title');
    await title.fill('<img src=x onerror="window.__pwned=true">');
    await title.press('Enter');
    await title.blur();
    await page.emulateMedia({ media: 'print' });
    await expect.poll(() => page.locator('gw-build-sheet h1').innerText()).toBe('<img src=x onerror="window.__pwned=true">');
    expect(await page.locator('gw-build-sheet img').count()).toBe(0);
    expect(await page.evaluate(() => (window as unknown as { __pwned: boolean }).__pwned)).toBe(false);
    expect(errors).toEqual([]);
    await page.context().close();
  });

  it('a damaged file leaves the current design untouched with a message', async () => {
    const { page } = await watchedPage(h);
    await page.goto(h.url);
    await expect.poll(() => partsText(page)).toMatch(/R1/);
    const parts = await partsText(page);
    const dir = mkdtempSync(join(tmpdir(), 'gw-e2e-'));
    const bad = join(dir, 'bad.json');
    writeFileSync(bad, '{"format":"gainwright-design","version":1,"sensor":');
    await page.locator('#open-file').setInputFiles(bad);
    await expect.poll(() => page.locator('.notice.bad').innerText()).toMatch(/not valid JSON/);
    expect(await partsText(page)).toBe(parts);
    await page.context().close();
  });

  it('is usable at 360 px wide', async () => {
    const { page, errors } = await watchedPage(h, { viewport: { width: 360, height: 740 } });
    await page.goto(h.url);
    await expect.poll(() => verdictText(page)).toMatch(/Pass|Caution|Fail/i);
    const overflow = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
    expect(overflow).toBeLessThanOrEqual(1);
    expect(errors).toEqual([]);
    await page.context().close();
  });

  it('a damaged autosave does not brick the app: it starts from the demo and offers the text', async () => {
    const { page, errors } = await watchedPage(h);
    await page.goto(h.url);
    await page.evaluate(() => localStorage.setItem('gainwright.autosave', '{"v":1,"design":{"format":"gainwright-design","version":1,"sensor":'));
    await page.reload();
    await expect.poll(() => page.locator('.notice.bad').innerText()).toMatch(/could not be read/);
    expect(await partsText(page)).toMatch(/R1/);
    const [download] = await Promise.all([page.waitForEvent('download'), page.getByRole('button', { name: 'Download the damaged text' }).click()]);
    const dir = mkdtempSync(join(tmpdir(), 'gw-e2e-'));
    await download.saveAs(join(dir, 'damaged.txt'));
    expect(readFileSync(join(dir, 'damaged.txt'), 'utf8')).toMatch(/"sensor":$/);
    expect(errors).toEqual([]);
    await page.context().close();
  });

  it('a damaged share link leaves the design alone with a message', async () => {
    const { page, errors } = await watchedPage(h);
    await page.goto(`${h.url}#d=eyJmb3JtYXQiOiJub3BlIn0`);
    await expect.poll(() => page.locator('.notice.bad').innerText()).toMatch(/link does not carry a usable design/);
    expect(await partsText(page)).toMatch(/R1/);
    expect(errors).toEqual([]);
    await page.context().close();
  });

  it('edge designs show guidance and never NaN or Infinity: a buffer, then a target no stage can reach', async () => {
    const { page, errors } = await watchedPage(h);
    await page.goto(h.url);
    await page.selectOption('select[aria-label="Load a demo"]', 'generic-sensor');
    await expect.poll(() => partsText(page)).toMatch(/R1/);
    await typeInto(page, 'target.zero', '2.5 V');
    await typeInto(page, 'target.scale', '12.5 mV/A');
    await expect.poll(() => verdictText(page)).toMatch(/Scale 12\.5 mV\/A/);
    const all = () => page.evaluate(() => {
      const text: string[] = [];
      const walk = (root: Document | ShadowRoot) => { for (const el of root.querySelectorAll('*')) { if (el.shadowRoot) walk(el.shadowRoot); } text.push((root as Document).body ? (root as Document).body.innerText : (root as ShadowRoot).textContent ?? ''); };
      walk(document);
      return text.join('\n');
    });
    expect(await all()).not.toMatch(/NaN|Infinity/);
    // The summing stage now attenuates; asked for a plain non-inverting stage, 5 mV/A from 12.5 mV/A has none.
    await page.selectOption('select[data-path="target.topology"]', { label: 'Non-inverting' });
    await typeInto(page, 'target.scale', '5 mV/A');
    await expect.poll(() => verdictText(page)).toMatch(/No design/);
    expect(await page.locator('gw-app').locator('li[data-code="guidance"]').first().innerText()).toMatch(/reverse the conductor/i);
    expect(await all()).not.toMatch(/NaN|Infinity/);
    expect(errors).toEqual([]);
    await page.context().close();
  });

  it('every control has an accessible name and can be reached with the keyboard', async () => {
    const { page } = await watchedPage(h);
    await page.goto(h.url);
    await expect.poll(() => partsText(page)).toMatch(/R1/);
    const unnamed = await page.evaluate(() => {
      const out: string[] = [];
      const walk = (root: Document | ShadowRoot) => {
        for (const el of root.querySelectorAll('input, select, button, textarea')) {
          const c = el as HTMLInputElement;
          if (c.type === 'file' || c.hidden) continue;
          const named = (c.labels && c.labels.length > 0) || c.getAttribute('aria-label') || c.getAttribute('aria-labelledby') || (el.tagName === 'BUTTON' && el.textContent!.trim());
          if (!named) out.push(`${el.tagName} ${c.getAttribute('data-path') ?? c.name ?? ''}`);
          if (c.tabIndex < 0) out.push(`not focusable: ${el.tagName}`);
        }
        for (const el of root.querySelectorAll('*')) if (el.shadowRoot) walk(el.shadowRoot);
      };
      walk(document);
      return out;
    });
    expect(unnamed).toEqual([]);
    // Tab from the top reaches the skip link first, then the demo picker.
    await page.keyboard.press('Tab');
    expect(await page.evaluate(() => document.activeElement?.shadowRoot?.activeElement?.textContent)).toBe('Skip to the verdict');
    await page.keyboard.press('Tab');
    expect(await page.evaluate(() => document.activeElement?.shadowRoot?.activeElement?.shadowRoot?.activeElement?.getAttribute('aria-label'))).toBe('Load a demo');
    await page.context().close();
  });

  // Since issue 15 the sheet also carries the verdict, the findings, the error budget by term and the trimmer
  // start positions, and a larger schematic: three pages at most.
  it('the build sheet prints on at most four A4 pages for every demo (verdict, findings, schematic, parts, calibration, budget, scope trace, readings table)', async () => {
    const { page } = await watchedPage(h);
    await page.goto(h.url);
    for (const demo of ['bench-clamp', 'appliance-ct', 'generic-sensor']) {
      await page.selectOption('select[aria-label="Load a demo"]', demo);
      const title = DEMOS.find((d) => d.id === demo)!.document.title;
      await expect.poll(() => field(page, 'title').inputValue()).toBe(title);
      await expect.poll(() => partsText(page)).toMatch(/R1/);
      const pdf = (await page.pdf({ format: 'A4' })).toString('latin1');
      const pages = (pdf.match(/\/Type\s*\/Page[^s]/g) ?? []).length;
      expect(pages, demo).toBeGreaterThanOrEqual(1);
      expect(pages, demo).toBeLessThanOrEqual(4);
    }
    await page.context().close();
  });
});
