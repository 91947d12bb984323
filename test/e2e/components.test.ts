/** Each element on its own in Chromium: accessible by default, default properties, events only on user input. */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { startHarness, watchedPage, type Harness } from './harness.js';

let h: Harness;
let page: Page;
beforeAll(async () => {
  h = await startHarness();
  page = (await watchedPage(h)).page;
  await page.goto(h.url);
  await page.waitForFunction(() => customElements.get('gw-field') && customElements.get('gw-parts'));
});
afterAll(async () => { await page?.context().close(); await h?.close(); });

describe('<gw-field>', () => {
  it('is labelled, has empty defaults, and fires gw-field-input only when a person changes it', async () => {
    const r = await page.evaluate(async () => {
      const el = document.createElement('gw-field') as HTMLElement & { path: string; label: string; value: string; message: string; updateComplete: Promise<unknown> };
      const events: unknown[] = [];
      el.addEventListener('gw-field-input', (e) => events.push((e as CustomEvent).detail));
      document.body.append(el);
      await el.updateComplete;
      const defaults = { path: el.path, value: el.value, message: el.message };
      el.path = 'opamp.gbw'; el.label = 'GBW'; el.value = '1 MHz';
      await el.updateComplete;
      const input = el.shadowRoot!.querySelector('input')!;
      const named = input.labels!.length > 0 && input.labels![0]!.textContent!.includes('GBW');
      const afterProp = events.length;
      input.value = '2 MHz';
      input.dispatchEvent(new Event('change', { bubbles: true }));
      el.message = 'cannot read';
      await el.updateComplete;
      const alert = el.shadowRoot!.querySelector('[role="alert"]')?.textContent;
      const invalid = input.getAttribute('aria-invalid');
      el.remove();
      return { defaults, named, afterProp, events, alert, invalid };
    });
    expect(r.defaults).toEqual({ path: '', value: '', message: '' });
    expect(r.named).toBe(true);
    expect(r.afterProp).toBe(0);
    expect(r.events).toEqual([{ path: 'opamp.gbw', text: '2 MHz' }]);
    expect(r.alert).toBe('cannot read');
    expect(r.invalid).toBe('true');
  });
});

describe('<gw-verdicts>', () => {
  it('renders an empty, named list by default and one item per verdict with its level', async () => {
    const r = await page.evaluate(async () => {
      const el = document.createElement('gw-verdicts') as HTMLElement & { verdicts: unknown[]; updateComplete: Promise<unknown> };
      document.body.append(el);
      await el.updateComplete;
      const empty = el.shadowRoot!.querySelectorAll('li').length;
      const name = el.shadowRoot!.querySelector('ul')!.getAttribute('aria-label');
      el.verdicts = [{ level: 'fail', title: 'A', detail: '<b>x</b>' }, { level: 'pass', title: 'B', detail: 'y' }];
      await el.updateComplete;
      const levels = [...el.shadowRoot!.querySelectorAll('li')].map((li) => li.getAttribute('data-level'));
      const bold = el.shadowRoot!.querySelectorAll('b').length;
      el.remove();
      return { empty, name, levels, bold };
    });
    expect(r).toEqual({ empty: 0, name: 'Verdict', levels: ['fail', 'pass'], bold: 0 });
  });
});

describe('<gw-parts>', () => {
  it('has a named table, and fires gw-set with the index only when an alternative is clicked', async () => {
    const r = await page.evaluate(async () => {
      const el = document.createElement('gw-parts') as HTMLElement & { rows: unknown[]; alternatives: unknown[]; chosen: number; updateComplete: Promise<unknown> };
      const events: unknown[] = [];
      el.addEventListener('gw-set', (e) => events.push((e as CustomEvent).detail));
      document.body.append(el);
      await el.updateComplete;
      const defaults = { rows: el.rows.length, alternatives: el.alternatives.length, chosen: el.chosen };
      const arm = (ohms: number) => ({ ohms, parts: [ohms], arrangement: 'single' });
      el.rows = [{ ref: 'R1', value: '10 kΩ', code: '10K', spec: 'E96', dissipation: 0, rating: 0.125, quantity: 1, role: 'feedback' }];
      el.alternatives = [{ a: arm(1e4), b: arm(1e3), error: 0, parts: 2, score: 0 }, { a: arm(2e4), b: arm(2e3), error: 0, parts: 2, score: 0 }];
      el.chosen = 1;
      await el.updateComplete;
      const afterProp = events.length;
      const radios = el.shadowRoot!.querySelectorAll('input[type="radio"]');
      const checked = [...radios].map((x) => (x as HTMLInputElement).checked);
      (radios[0] as HTMLInputElement).click();
      const table = el.shadowRoot!.querySelector('table')!.getAttribute('aria-label');
      el.remove();
      return { defaults, afterProp, checked, events, table };
    });
    expect(r.defaults).toEqual({ rows: 0, alternatives: 0, chosen: 0 });
    expect(r.afterProp).toBe(0);
    expect(r.checked).toEqual([false, true]);
    expect(r.events).toEqual([{ path: 'target.alternative', value: 0 }]);
    expect(r.table).toBe('Parts list');
  });
});

describe('<gw-schematic> and <gw-chart>', () => {
  it('say so when there is nothing to draw, and draw text as text', async () => {
    const r = await page.evaluate(async () => {
      const s = document.createElement('gw-schematic') as HTMLElement & { drawing: unknown; updateComplete: Promise<unknown> };
      document.body.append(s);
      await s.updateComplete;
      const empty = s.shadowRoot!.textContent!.includes('No schematic');
      s.drawing = { width: 100, height: 50, prims: [{ t: 'text', x: 1, y: 10, text: '<script>x</script>' }] };
      await s.updateComplete;
      const scripts = s.shadowRoot!.querySelectorAll('script').length;
      const img = s.shadowRoot!.querySelector('svg')!.getAttribute('role');
      s.remove();
      const c = document.createElement('gw-chart') as HTMLElement & { data: unknown; updateComplete: Promise<unknown> };
      document.body.append(c);
      await c.updateComplete;
      const noData = c.data === null && !!c.shadowRoot!.querySelector('canvas[role="img"]');
      c.remove();
      return { empty, scripts, img, noData };
    });
    expect(r).toEqual({ empty: true, scripts: 0, img: 'img', noData: true });
  });
});
