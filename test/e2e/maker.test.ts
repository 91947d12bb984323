/** Issue 15 in Chromium: units read as meant, gain, words, calibration per sensor, the build sheet, supply, access. */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { startHarness, watchedPage, type Harness } from './harness.js';

let h: Harness;
beforeAll(async () => { h = await startHarness(); });
afterAll(async () => { await h?.close(); });

const field = (page: Page, path: string) => page.locator(`input[data-path="${path}"]`);
const fieldBox = (page: Page, path: string) => page.locator(`gw-field[path="${path}"]`);
const partsText = (page: Page) => page.locator('gw-parts').first().locator('tbody').innerText();
const verdictText = (page: Page) => page.locator('gw-verdicts ul').first().innerText();
const panel = (page: Page, heading: string) => page.locator('.panel', { has: page.locator(`h2:text-is("${heading}")`) });

async function typeInto(page: Page, path: string, text: string): Promise<void> {
  const f = field(page, path);
  await f.fill(text);
  await f.press('Enter');
  await f.blur();
}

async function openDemo(page: Page, id: string): Promise<void> {
  await page.goto(h.url);
  await expect.poll(() => partsText(page)).toMatch(/R1/);
  if (id !== 'bench-clamp') {
    await page.selectOption('select[aria-label="Load a demo"]', id);
    await expect.poll(() => page.locator('.notice').innerText()).toMatch(/Loaded the demo/);
  }
}

describe('units are read as a person means them', () => {
  it('a trailing m in a length field is metres, shown back in mm with how it was read', async () => {
    const { page, errors } = await watchedPage(h);
    await openDemo(page, 'bench-clamp');
    await typeInto(page, 'sensor.core.pathLength', '0.06 m');
    await expect.poll(() => field(page, 'sensor.core.pathLength').inputValue()).toBe('60 mm');
    await typeInto(page, 'sensor.core.gap', '0.0015 m');
    await expect.poll(() => fieldBox(page, 'sensor.core.gap').locator('.read-as').innerText()).toBe('read as 1.5 mm');
    expect(await field(page, 'sensor.core.gap').inputValue()).toBe('1.5 mm');
    // A bare number is in the field's shown unit: 1.6 in the gap is 1.6 mm.
    await typeInto(page, 'sensor.core.gap', '1.6');
    await expect.poll(() => field(page, 'sensor.core.gap').inputValue()).toBe('1.6 mm');
    expect(errors).toEqual([]);
    await page.context().close();
  });

  it('unit names in any case, prefixes by case, a bare scale in mV/A, and arithmetic', async () => {
    const { page, errors } = await watchedPage(h);
    await openDemo(page, 'generic-sensor');
    await typeInto(page, 'supply.positive', '9 v');
    await expect.poll(() => fieldBox(page, 'supply.positive').locator('.read-as').innerText()).toBe('read as 9 V');
    await typeInto(page, 'target.bandwidth', '20 khz');
    await expect.poll(() => field(page, 'target.bandwidth').inputValue()).toBe('20 kHz');
    await typeInto(page, 'target.bandwidth', '20 KHz');
    await expect.poll(() => fieldBox(page, 'target.bandwidth').locator('.read-as').innerText()).toBe('read as 20 kHz');
    await typeInto(page, 'target.scale', '100');
    await expect.poll(() => field(page, 'target.scale').inputValue()).toBe('100 mV/A');
    await expect.poll(() => verdictText(page)).toMatch(/Scale 100 mV\/A/);
    // 1/(2π · 10 kΩ · 10 nF) = 1591.5 Hz (RC corner, any circuits textbook).
    await typeInto(page, 'target.bandwidth', '1/(2*pi*10k*10n)');
    await expect.poll(() => field(page, 'target.bandwidth').inputValue()).toBe('1.592 kHz');
    await typeInto(page, 'supply.positive', '9 V - 0.7 V');
    await expect.poll(() => field(page, 'supply.positive').inputValue()).toBe('8.3 V');
    expect(errors).toEqual([]);
    await page.context().close();
  });

  it('refused values are named at their field and the design stays', async () => {
    const { page } = await watchedPage(h);
    await openDemo(page, 'generic-sensor');
    const parts = await partsText(page);
    await typeInto(page, 'supply.positive', '9 V - 0.7 A');
    await expect.poll(() => fieldBox(page, 'supply.positive').locator('[role="alert"]').innerText()).toMatch(/cannot read "9 V - 0.7 A" as a voltage/);
    await typeInto(page, 'opamp.gbw', '2 kV');
    await expect.poll(() => fieldBox(page, 'opamp.gbw').locator('[role="alert"]').innerText()).toMatch(/cannot read "2 kV" as a frequency/);
    expect(await partsText(page)).toBe(parts);
    await page.context().close();
  });

  it('fields show the trade\'s units: mV/mT, V/µs, nV/√Hz', async () => {
    const { page } = await watchedPage(h);
    await openDemo(page, 'bench-clamp');
    expect(await field(page, 'sensor.hallSensitivity').inputValue()).toBe('25 mV/mT');
    expect(await field(page, 'opamp.slewRate').inputValue()).toMatch(/^[\d.]+ V\/µs$/);
    expect(await field(page, 'opamp.voltageNoise').inputValue()).toMatch(/^[\d.]+ nV\/√Hz$/);
    await typeInto(page, 'opamp.slewRate', '0.5');
    await expect.poll(() => field(page, 'opamp.slewRate').inputValue()).toBe('0.5 V/µs');
    await page.context().close();
  });

  it('a gain states the target too: both are shown, with the polarity it implies', async () => {
    const { page } = await watchedPage(h);
    await openDemo(page, 'generic-sensor');
    // The demo sensor gives 12.5 mV/A: a gain of 8 is 100 mV/A, a gain of −8 is −100 mV/A.
    await typeInto(page, 'target.gain', '8');
    await expect.poll(() => field(page, 'target.scale').inputValue()).toBe('100 mV/A');
    expect(await fieldBox(page, 'target.scale').locator('.hint').innerText()).toMatch(/gain 8: keeps the sensor's polarity/);
    await typeInto(page, 'target.zero', '2.5 V');
    await typeInto(page, 'target.gain', '-8');
    await expect.poll(() => field(page, 'target.scale').inputValue()).toBe('-100 mV/A');
    expect(await fieldBox(page, 'target.gain').locator('.hint').innerText()).toMatch(/inverts the sensor's polarity/);
    await page.context().close();
  });
});

describe('layout', () => {
  it('one title field; header buttons on one line at 1280 px; selects wide enough for their choice', async () => {
    const { page } = await watchedPage(h, { viewport: { width: 1280, height: 900 } });
    await openDemo(page, 'bench-clamp');
    const [titles, found] = await page.evaluate(() => {
      let n = 0;
      const found: string[] = [];
      const walk = (root: Document | ShadowRoot) => {
        for (const el of root.querySelectorAll('input')) if (/title/i.test(`${el.getAttribute('data-path')} ${el.getAttribute('aria-label')}`)) { n++; found.push(`${(root as ShadowRoot).host?.tagName ?? 'document'}: ${el.outerHTML.slice(0, 120)}`); }
        for (const el of root.querySelectorAll('*')) if (el.shadowRoot) walk(el.shadowRoot);
      };
      walk(document);
      return [n, found] as const;
    });
    expect(titles, found.join(' | ')).toBe(1);
    const tops = await page.locator('gw-toolbar button').evaluateAll((bs) => bs.map((b) => (b as HTMLElement).getBoundingClientRect().top));
    expect(tops.length).toBe(6);
    expect(new Set(tops).size).toBe(1);
    // Each select is at least as wide as its chosen text plus room for the arrow.
    const short = await page.locator('gw-editor select').evaluateAll((ss) => ss.map((el) => {
      const s = el as HTMLSelectElement;
      const ctx = document.createElement('canvas').getContext('2d')!;
      const cs = getComputedStyle(s);
      ctx.font = `${cs.fontSize} ${cs.fontFamily}`;
      const need = ctx.measureText(s.selectedOptions[0]?.text ?? '').width + 20;
      return need > s.clientWidth ? `${s.getAttribute('data-path')}: ${Math.round(need)} > ${s.clientWidth}` : '';
    }).filter(Boolean));
    expect(short).toEqual([]);
    await page.context().close();
  });
});

describe('words', () => {
  it('an inverting stage asked for the sensor\'s own sign is explained by polarity, with the fix', async () => {
    const { page } = await watchedPage(h);
    await openDemo(page, 'generic-sensor');
    await page.selectOption('select[data-path="target.topology"]', { label: 'Inverting' });
    await expect.poll(() => verdictText(page)).toMatch(/No design/);
    const guidance = await panel(page, 'Findings').innerText();
    expect(guidance).toMatch(/polarity is the cause/);
    expect(guidance).toMatch(/Reverse the conductor/);
    expect(guidance).not.toMatch(/rail-to-rail/);
    await page.context().close();
  });
});

describe('calibration steps follow the sensor', () => {
  it('current transformer: AC from an isolating transformer, never DC; the burden is in the parts list and CSV', async () => {
    const { page } = await watchedPage(h);
    await openDemo(page, 'appliance-ct');
    const cal = await panel(page, 'Calibration').innerText();
    expect(cal).toMatch(/isolating low-voltage transformer/);
    expect(cal).toMatch(/never a DC supply/);
    expect(cal).not.toMatch(/current-limited bench supply/);
    expect(cal).toMatch(/100 MΩ input/);
    expect(await partsText(page)).toMatch(/RB\s+33\.0 Ω/);
    const [download] = await Promise.all([page.waitForEvent('download'), page.getByRole('button', { name: 'Parts CSV' }).click()]);
    const file = join(mkdtempSync(join(tmpdir(), 'gw-e2e-')), 'parts.csv');
    await download.saveAs(file);
    expect(readFileSync(file, 'utf8')).toMatch(/"RB","33\.0 Ω"/);
    await page.context().close();
  });

  it('shunt: driven through the shunt itself, no turns, no probe', async () => {
    const { page } = await watchedPage(h);
    await openDemo(page, 'generic-sensor');
    await page.selectOption('select[data-path="sensor.type"]', 'shunt');
    // A low-side shunt sits at 0 V: a split supply lets the stage read both signs around a 0 V zero.
    await typeInto(page, 'supply.negative', '-5 V');
    await typeInto(page, 'target.zero', '0 V');
    await typeInto(page, 'target.range.0', '-5');
    await typeInto(page, 'target.range.1', '5');
    await expect.poll(() => panel(page, 'Calibration').innerText()).toMatch(/through the shunt/);
    const cal = await panel(page, 'Calibration').innerText();
    expect(cal).not.toMatch(/turns|probe only|insulated conductor/);
    await page.context().close();
  });

  it('Hall clamp: turns through the core from a bench supply, span by difference so zero and span do not interact', async () => {
    const { page } = await watchedPage(h);
    await openDemo(page, 'bench-clamp');
    const cal = await panel(page, 'Calibration').innerText();
    expect(cal).toMatch(/turns of insulated wire through the core/);
    expect(cal).toMatch(/zero and span do not interact/);
    expect(cal).toMatch(/set RV1 \(span trimmer\) to \d+ %/);
    await page.context().close();
  });
});

describe('the build sheet tells the truth', () => {
  it('a failing design prints its verdict and findings first and is marked failed in the head every page repeats', async () => {
    const { page } = await watchedPage(h);
    await openDemo(page, 'generic-sensor');
    // A non-inverting stage cannot attenuate: 5 mV/A from a 12.5 mV/A sensor has no stage.
    await page.selectOption('select[data-path="target.topology"]', { label: 'Non-inverting' });
    await typeInto(page, 'target.scale', '5 mV/A');
    await expect.poll(() => verdictText(page)).toMatch(/No design/);
    await page.emulateMedia({ media: 'print' });
    const sheet = page.locator('gw-build-sheet table.page');
    await expect.poll(() => sheet.isVisible()).toBe(true);
    const text = await sheet.innerText();
    const status = await sheet.locator('.status').innerText();
    expect(status).toMatch(/FAILED DESIGN/);
    expect(text.startsWith(status)).toBe(true);
    expect(text.indexOf('Verdict')).toBeLessThan(text.indexOf('Schematic'));
    expect(text.indexOf('Findings')).toBeLessThan(text.indexOf('Schematic'));
    // CSS 2.1 §17.2: a table-header-group is repeated at the top of each page the table spans in print.
    expect(await sheet.locator('thead').first().evaluate((el) => getComputedStyle(el).display)).toBe('table-header-group');
    expect(await sheet.locator('thead .status').innerText()).toMatch(/FAILED DESIGN: do not build/);
    // No grey page behind the sheet when backgrounds are printed.
    expect(await page.evaluate(() => getComputedStyle(document.body).backgroundColor)).toBe('rgb(255, 255, 255)');
    await page.context().close();
  });

  it('a good design prints the error budget by term, trimmer start positions and a schematic at readable size', async () => {
    const { page } = await watchedPage(h);
    await openDemo(page, 'bench-clamp');
    await page.emulateMedia({ media: 'print' });
    const sheet = page.locator('gw-build-sheet table.page');
    await expect.poll(() => sheet.isVisible()).toBe(true);
    const text = await sheet.innerText();
    expect(text).not.toMatch(/FAILED/);
    expect(text).toMatch(/Error budget at the range end/);
    expect(text).toMatch(/op-amp offset voltage/);
    expect(text).toMatch(/Trimmer start positions/);
    expect(text).toMatch(/RV1\s+100 kΩ\s+span trimmer\s+\d+ %/);
    // Label type in the schematic prints at 6 pt or more (11 drawing units scaled by the drawn width).
    const pt = await sheet.locator('gw-schematic').evaluate((el) => {
      const svg = el.shadowRoot!.querySelector('svg')!;
      const scale = svg.getBoundingClientRect().width / svg.viewBox.baseVal.width;
      return 11 * scale * 0.75;
    });
    expect(pt).toBeGreaterThanOrEqual(6);
    await page.context().close();
  });

  it('offers the SPICE netlist as a download', async () => {
    const { page } = await watchedPage(h);
    await openDemo(page, 'bench-clamp');
    const [download] = await Promise.all([page.waitForEvent('download'), page.getByRole('button', { name: 'SPICE netlist' }).click()]);
    expect(download.suggestedFilename()).toMatch(/\.cir$/);
    const file = join(mkdtempSync(join(tmpdir(), 'gw-e2e-')), 'net.cir');
    await download.saveAs(file);
    const net = readFileSync(file, 'utf8');
    expect(net).toMatch(/^\.end\s*$/m);
    expect(net).toMatch(/^R1 /m);
    await page.context().close();
  });
});

describe('battery and supply', () => {
  it('a 5 V sensor fed from the 9.6 V battery is an over-voltage failure', async () => {
    const { page } = await watchedPage(h);
    await openDemo(page, 'bench-clamp');
    await typeInto(page, 'sensor.supplyMax', '5.5');
    await expect.poll(() => field(page, 'sensor.supplyMax').inputValue()).toBe('5.5 V');
    expect(await verdictText(page)).not.toMatch(/above its rated supply/);
    await page.selectOption('select[data-path="supply.sensorRail"]', { label: 'Positive rail' });
    await expect.poll(() => verdictText(page)).toMatch(/Sensor fed above its rated supply/);
    expect(await verdictText(page)).toMatch(/9\.60 V/);
    await page.context().close();
  });

  it('a 5 V regulator on a 5 V rail is refused at its field', async () => {
    const { page } = await watchedPage(h);
    await openDemo(page, 'bench-clamp');
    await typeInto(page, 'supply.positive', '5');
    // The refusal is said at the field typed into, naming the regulator and the fix by their labels (issue 14's rule).
    await expect.poll(() => fieldBox(page, 'supply.positive').locator('[role="alert"]').innerText()).toMatch(/Regulated voltage.*dropout/);
    await page.context().close();
  });

  it('no advice to regulate the reference when it is already regulated', async () => {
    const { page } = await watchedPage(h);
    await openDemo(page, 'bench-clamp');
    expect(await panel(page, 'Findings').innerText()).not.toMatch(/feed the reference from a regulated rail/);
    await page.context().close();
  });

  it('the Monte Carlo trials field sets the number of builds', async () => {
    const { page } = await watchedPage(h);
    await openDemo(page, 'bench-clamp');
    await typeInto(page, 'analysis.spreadTrials', '1000');
    await expect.poll(() => page.locator('gw-chart[data-chart="spread"] .summary').innerText()).toMatch(/over 1000 builds/);
    await page.context().close();
  });
});

describe('access for everyone', () => {
  it('verdict changes are announced in a live region', async () => {
    const { page } = await watchedPage(h);
    await openDemo(page, 'generic-sensor');
    const live = page.locator('[aria-live="polite"]#verdict-live');
    await expect.poll(() => live.textContent()).toMatch(/^Verdict: 0 fail/);
    await page.selectOption('select[data-path="target.topology"]', { label: 'Non-inverting' });
    await typeInto(page, 'target.scale', '5 mV/A');
    await expect.poll(() => live.textContent()).toMatch(/^Verdict: 1 fail.*first: No design/);
    await page.context().close();
  });

  it('the skip link moves focus to the verdict; dismissing a notice leaves focus on the verdict, not the body', async () => {
    const { page } = await watchedPage(h);
    await page.goto(h.url);
    await expect.poll(() => partsText(page)).toMatch(/R1/);
    const active = () => page.evaluate(() => document.activeElement?.shadowRoot?.activeElement?.id || document.activeElement?.tagName);
    await page.keyboard.press('Tab');
    await page.keyboard.press('Enter');
    await expect.poll(active).toBe('verdict');
    await page.selectOption('select[aria-label="Load a demo"]', 'appliance-ct');
    await page.getByRole('button', { name: 'Dismiss' }).click();
    await expect.poll(active).toBe('verdict');
    await page.context().close();
  });

  it('every chart has a text alternative: a summary and its data as a table on request', async () => {
    const { page } = await watchedPage(h);
    await openDemo(page, 'bench-clamp');
    const charts = page.locator('gw-chart');
    await expect.poll(() => charts.count()).toBeGreaterThanOrEqual(4);
    const n = await charts.count();
    for (let i = 0; i < n; i++) {
      const c = charts.nth(i);
      expect(await c.locator('.summary').innerText()).toMatch(/ to /);
      expect(await c.locator('canvas').getAttribute('aria-describedby')).toBe('summary');
      await c.locator('details summary').click();
      await expect.poll(() => c.locator('details table tbody tr').count()).toBeGreaterThan(1);
    }
    await page.context().close();
  });

  it('the decimal keypad only on number fields', async () => {
    const { page } = await watchedPage(h);
    await openDemo(page, 'bench-clamp');
    expect(await field(page, 'title').getAttribute('inputmode')).toBe('text');
    expect(await field(page, 'notes').getAttribute('inputmode')).toBe('text');
    expect(await field(page, 'opamp.gbw').getAttribute('inputmode')).toBe('decimal');
    await page.context().close();
  });
});
