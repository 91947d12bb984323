/** Serves dist/ on a free localhost port and launches Debian's Chromium through playwright-core. */
import { preview, type PreviewServer } from 'vite';
import { chromium, type Browser, type Page } from 'playwright-core';
import { existsSync } from 'node:fs';

export const CHROMIUM = process.env.CHROMIUM_PATH || '/usr/bin/chromium';
export const CHROMIUM_ARGS = ['--headless', '--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--no-first-run'];

export interface Harness {
  server: PreviewServer;
  browser: Browser;
  url: string;
  close(): Promise<void>;
}

export async function startHarness(): Promise<Harness> {
  if (!existsSync('dist/index.html')) throw new Error('dist/ is missing: run `npx vite build` first (npm test does)');
  const server = await preview({ preview: { port: 0, host: '127.0.0.1', strictPort: false }, logLevel: 'silent' });
  const addr = server.httpServer.address();
  const port = typeof addr === 'object' && addr ? addr.port : 4173;
  const browser = await chromium.launch({ executablePath: CHROMIUM, args: CHROMIUM_ARGS });
  return {
    server, browser, url: `http://127.0.0.1:${port}/`,
    async close() { await browser.close(); await new Promise<void>((res) => server.httpServer.close(() => res())); },
  };
}

export interface Watched {
  page: Page;
  errors: string[];
  offsite: string[];
}

/** A page that records console errors, page errors and every request that leaves localhost. */
export async function watchedPage(h: Harness, opts: Parameters<Browser['newContext']>[0] = {}): Promise<Watched> {
  const ctx = await h.browser.newContext({ viewport: { width: 1300, height: 1000 }, acceptDownloads: true, ...opts });
  const page = await ctx.newPage();
  const errors: string[] = [];
  const offsite: string[] = [];
  page.on('console', (m) => { if (m.type() === 'error') errors.push(m.text()); });
  page.on('pageerror', (e) => errors.push(String(e)));
  page.on('request', (r) => {
    const u = new URL(r.url());
    if (!['127.0.0.1', 'localhost'].includes(u.hostname) && !['data:', 'blob:'].includes(u.protocol)) offsite.push(r.url());
  });
  return { page, errors, offsite };
}

/** Evaluates inside <gw-app>'s shadow root. */
export const app = (page: Page) => page.locator('gw-app');

/** The fixed resistors of the design in force (read from the app's own report), output series resistor left out. */
export const fixedParts = (page: Page) => page.evaluate(() => {
  const a = document.querySelector('gw-app') as unknown as { currentReport: { stage: { parts: Array<{ kind: string; role: string; ohms: number }> } | null } | null };
  return (a.currentReport?.stage?.parts ?? []).filter((p) => p.kind === 'resistor' && p.role !== 'output-series').map((p) => p.ohms);
});

/** The resistor kit of the design in force (null: none). */
export const kitOf = (page: Page) => page.evaluate(() => (document.querySelector('gw-app') as unknown as { currentDesign: { target: { kit?: unknown } } }).currentDesign.target.kit ?? null);
