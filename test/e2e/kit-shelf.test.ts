/**
 * The person's resistor kits in Chromium (issue 18): picking a kit shape re-solves the design from it, a kit
 * kept in the browser survives a reload and comes back, a kit file saved and opened again gives the same kit,
 * and a bad file is refused with a message while the design stays. Series membership from IEC 60063
 * (published); kits and designs are scenarios of our own.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fixedParts, kitOf, startHarness, watchedPage, type Harness } from './harness.js';
import { isMember } from '../../src/model/eseries.js';

let h: Harness;
beforeAll(async () => { h = await startHarness(); });
afterAll(async () => { await h?.close(); });

/** Whether every fixed resistor of the design in force is a member of the series (and there are some). */
const allIn = async (page: Page, series: 'E6' | 'E12' | 'E24') => { const p = await fixedParts(page); return p.length > 1 && p.every((x) => isMember(x, series)); };
const E6_KIT = { series: 'E6', min: 100, max: 1e6, parts: [] };
const said = (page: Page) => page.locator('gw-kit-editor .said').innerText();

describe('the person\'s kits in the app', () => {
  it('a kit shape re-solves the design; kept in the browser, it comes back after a reload; saved as a file and opened, the same kit', async () => {
    const { page, errors, offsite } = await watchedPage(h);
    await page.goto(h.url);
    await page.locator('gw-verdicts li').first().waitFor();
    await page.locator('gw-kit-editor input[type=checkbox]').check();
    await expect.poll(() => kitOf(page)).not.toBeNull();
    // Pick the small starter kit: the design is solved again from E6 values alone.
    await page.locator('gw-kit-editor select[aria-label="Kit shape"]').selectOption('e6-100-1m');
    await expect.poll(() => kitOf(page)).toEqual(E6_KIT);
    await expect.poll(() => allIn(page, 'E6')).toBe(true);

    // Keep it in the browser under a name, then design without it and reload the page.
    await page.locator('gw-kit-editor input[aria-label="Kit name"]').fill('bench drawer');
    await page.locator('gw-kit-editor input[aria-label="Kit name"]').dispatchEvent('change');
    await page.locator('gw-kit-editor button', { hasText: 'Keep in this browser' }).click();
    await expect.poll(() => said(page)).toMatch(/Kept "bench drawer" in this browser/);
    await page.locator('gw-kit-editor input[type=checkbox]').uncheck();
    await expect.poll(() => kitOf(page)).toBeNull();
    await page.reload();
    await page.locator('gw-verdicts li').first().waitFor();
    expect(await kitOf(page)).toBeNull();
    await expect.poll(() => page.locator('gw-kit-editor select[aria-label="Kept kits"] option').allInnerTexts()).toEqual(['bench drawer']);
    await page.locator('gw-kit-editor button', { hasText: /^Use$/ }).click();
    await expect.poll(() => kitOf(page)).toEqual(E6_KIT);
    // The name it was kept by is the name it is saved by.
    expect(await page.locator('gw-kit-editor input[aria-label="Kit name"]').inputValue()).toBe('bench drawer');
    await expect.poll(() => allIn(page, 'E6')).toBe(true);

    // Save as a file; switch to another shape; open the file: the kit saved comes back.
    const download = page.waitForEvent('download');
    await page.locator('gw-kit-editor button', { hasText: 'Save as a file' }).click();
    const saved = await (await download).path();
    const doc = JSON.parse(readFileSync(saved!, 'utf8'));
    expect(doc).toEqual({ format: 'gainwright-kit', version: 1, name: 'bench drawer', kit: E6_KIT });
    await page.locator('gw-kit-editor select[aria-label="Kit shape"]').selectOption('e24-1-1m');
    await expect.poll(() => kitOf(page)).toMatchObject({ series: 'E24' });
    await page.locator('gw-kit-editor input[type=file]').setInputFiles(saved!);
    await expect.poll(() => kitOf(page)).toEqual(E6_KIT);
    await expect.poll(() => said(page)).toMatch(/^Read ".*" from /);
    await expect.poll(() => allIn(page, 'E6')).toBe(true);
    expect(errors).toEqual([]);
    expect(offsite).toEqual([]);
    await page.context().close();
  });

  it('a bad kit file gets a message naming the problem and the kit and design stay; a name with markup stays text', async () => {
    const { page, errors } = await watchedPage(h);
    await page.goto(h.url);
    await page.locator('gw-verdicts li').first().waitFor();
    await page.locator('gw-kit-editor input[type=checkbox]').check();
    await page.locator('gw-kit-editor select[aria-label="Kit shape"]').selectOption('e6-100-1m');
    await expect.poll(() => kitOf(page)).toEqual(E6_KIT);
    const before = await page.evaluate(() => JSON.stringify((document.querySelector('gw-app') as unknown as { currentDesign: unknown }).currentDesign));
    const dir = mkdtempSync(join(tmpdir(), 'gw-kits-'));
    const bad = join(dir, 'bad.json');
    writeFileSync(bad, JSON.stringify({ format: 'gainwright-kit', version: 1, name: 'x', kit: { series: 'E12', min: 1e5, max: 1e3 } }));
    await page.locator('gw-kit-editor input[type=file]').setInputFiles(bad);
    await expect.poll(() => page.locator('gw-kit-editor .said.bad[role=alert]').innerText()).toMatch(/bad\.json is not a kit file, so the kit stays as it was: kit\.min must be below kit\.max/);
    const broken = join(dir, 'broken.json');
    writeFileSync(broken, '{ "format": "gainwright-kit", ');
    await page.locator('gw-kit-editor input[type=file]').setInputFiles(broken);
    await expect.poll(() => said(page)).toMatch(/broken\.json is not a kit file.*not valid JSON/);
    // A good file whose kit holds nothing in the design's resistance window (0.5 Ω; the window starts at 1 Ω at
    // the lowest): the design refuses it as a whole, says so, and keeps its own kit.
    const tiny = join(dir, 'tiny.json');
    writeFileSync(tiny, JSON.stringify({ format: 'gainwright-kit', version: 1, name: 'tiny', kit: { parts: [{ ohms: 0.5 }] } }));
    await page.locator('gw-kit-editor input[type=file]').setInputFiles(tiny);
    await expect.poll(() => page.locator('[data-notice="message"]').innerText()).toMatch(/^Not applied: /);
    expect(await kitOf(page)).toEqual(E6_KIT);
    const after = await page.evaluate(() => JSON.stringify((document.querySelector('gw-app') as unknown as { currentDesign: unknown }).currentDesign));
    expect(after).toBe(before);

    // A kit of our own named with markup: opened, its name is shown as the characters it is.
    const marked = join(dir, 'marked.json');
    writeFileSync(marked, JSON.stringify({ format: 'gainwright-kit', version: 1, name: '<img src=x onerror=alert(1)> box', kit: { series: 'E12', min: 10, max: 1e6 } }));
    await page.locator('gw-kit-editor input[type=file]').setInputFiles(marked);
    await expect.poll(() => said(page)).toBe('Read "<img src=x onerror=alert(1)> box" from marked.json.');
    await expect.poll(() => kitOf(page)).toEqual({ series: 'E12', min: 10, max: 1e6, parts: [] });
    expect(await page.locator('gw-kit-editor img').count()).toBe(0);
    expect(errors).toEqual([]);
    await page.context().close();
  });
});
