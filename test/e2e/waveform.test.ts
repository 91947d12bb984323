import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { DEMOS } from '../../src/model/demos.js';
import { startHarness, watchedPage, type Harness } from './harness.js';

let h: Harness;
beforeAll(async () => { h = await startHarness(); });
afterAll(async () => { await h?.close(); });

/** The scope chart's data and whether Chart.js drew it on its canvas. */
const scope = (page: Page) => page.evaluate(() => {
  const app = document.querySelector('gw-app')!.shadowRoot!;
  const el = app.querySelector('gw-chart[data-chart="waveform"]') as unknown as (HTMLElement & { data: { title: string; series: Array<{ label: string; points: Array<{ x: number; y: number }> }> } }) | null;
  if (!el) return null;
  const canvas = el.shadowRoot?.querySelector('canvas') as HTMLCanvasElement | null;
  return { title: el.data.title, output: el.data.series[0]!.points.length, ideal: el.data.series[1]!.points.length, first: JSON.stringify(el.data.series[0]!.points.slice(0, 3)), drawn: !!canvas && canvas.width > 0 && canvas.height > 0 };
});
const figures = (page: Page) => page.locator('#scope gw-figures table').innerText();

describe('the scope view in Chromium', () => {
  it('shows the waveform plot and its figures for every demo', async () => {
    const { page, errors } = await watchedPage(h);
    await page.goto(h.url);
    for (const demo of DEMOS) {
      await page.selectOption('select[aria-label="Load a demo"]', demo.id);
      await expect.poll(() => page.locator('input[data-path="title"]').inputValue()).toBe(demo.document.title);
      await expect.poll(async () => (await scope(page))?.drawn ?? false, { message: demo.id }).toBe(true);
      const s = (await scope(page))!;
      expect(s.title).toBe('What the scope shows');
      expect(s.output, demo.id).toBeGreaterThan(1000);
      expect(s.ideal, demo.id).toBeGreaterThan(1000);
      const f = await figures(page);
      expect(f, demo.id).toMatch(/Rise time/);
      expect(f, demo.id).toMatch(/step .* → /);
      expect(f, demo.id).not.toMatch(/NaN|Infinity/);
    }
    expect(errors).toEqual([]);
    await page.context().close();
  });

  it('a waveform chosen in the editor replaces the starting step, and the printed sheet draws it', async () => {
    const { page, errors } = await watchedPage(h);
    await page.goto(h.url);
    await expect.poll(async () => (await scope(page))?.drawn ?? false).toBe(true);
    const before = (await scope(page))!.first;
    await page.locator('input[data-path="analysis.waveform"]').check();
    const shape = page.locator('select[data-path="analysis.waveform.shape"]');
    await expect.poll(() => shape.count()).toBe(1);
    await shape.selectOption({ label: 'Square' });
    await expect.poll(() => figures(page)).toMatch(/square wave/);
    expect((await scope(page))!.first).not.toBe(before);
    await page.emulateMedia({ media: 'print' });
    const lines = await page.evaluate(() => document.querySelector('gw-app')!.shadowRoot!.querySelector('.sheet gw-trace')!.shadowRoot!.querySelectorAll('polyline').length);
    expect(lines).toBeGreaterThanOrEqual(2);
    expect(errors).toEqual([]);
    await page.context().close();
  });
});
