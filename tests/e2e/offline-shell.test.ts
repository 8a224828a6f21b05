import { cpSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import type { Server } from 'node:http';
import os from 'node:os';
import path from 'node:path';
import { PNG } from 'pngjs';
import type { BrowserContext, Page } from 'playwright-core';
import { QueryTypes } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import theme from '../../tailwind.config';
import { createApp } from '../../server/app';
import type { LedgerActor } from '../../server/ledger/types';
import { openScanner, wedgeScan } from '../../scripts/bench-scan';
import { createUser, TEST_PASSWORD } from '../factories';
import { createSample, createSpecimen, managerActor } from '../ledger/ledger-fixtures';
import { patientPoll as poll, startBrowserRig, VIEWPORTS, type BrowserRig } from './browser';

let rig: BrowserRig;
let actor: LedgerActor;
let sampleId: number;

beforeAll(async () => {
  rig = await startBrowserRig();
  actor = await managerActor(rig.t);
  ({ sampleId } = await createSample(rig.t));
});
afterAll(() => rig?.close());

/** Waits until the app-shell worker is active and controls the page. */
async function untilWorkerControls(page: Page): Promise<void> {
  await page.evaluate(async () => {
    await navigator.serviceWorker.ready;
  });
  await poll(() => page.evaluate(() => navigator.serviceWorker.controller !== null)).toBe(true);
}

/** Every URL kept in the page's Cache Storage. */
function cachedUrls(page: Page): Promise<string[]> {
  return page.evaluate(async () => {
    const urls: string[] = [];
    for (const name of await caches.keys()) {
      for (const req of await (await caches.open(name)).keys()) urls.push(new URL(req.url).pathname);
    }
    return urls;
  });
}

/** The cut events recorded for a code, read through the owner's connection. */
async function cutsOf(code: string): Promise<{ idempotency_key: string }[]> {
  return rig.t.owner.query(`SELECT idempotency_key FROM custody_events WHERE type = 'cut' AND item_code = $1`, {
    bind: [code],
    type: QueryTypes.SELECT,
  });
}

describe('the app shell offline', { timeout: 180_000 }, () => {
  it('opens /scan with no network after one online visit, keeps a scan, and records it once when the network returns', async () => {
    const user = await createUser(rig.t, 'machinist');
    const code = await createSpecimen(rig.t, actor, sampleId);
    const { context, page } = await rig.newPage('phone');
    // The ledger must never be answered from a cache: no /api response may come from the worker.
    const fromWorker: string[] = [];
    context.on('response', (res) => {
      if (new URL(res.url()).pathname.startsWith('/api/') && res.fromServiceWorker()) fromWorker.push(res.url());
    });

    await openScanner(page, user.email, TEST_PASSWORD);
    await untilWorkerControls(page);
    const cached = await cachedUrls(page);
    expect(cached).toContain('/index.html');
    expect(cached).toContain('/manifest.webmanifest');
    expect(cached.some((u) => /^\/assets\/scan-[\w-]+\.js$/.test(u))).toBe(true);
    expect(cached.some((u) => /^\/assets\/inter-latin-400-normal-[\w-]+\.woff2$/.test(u))).toBe(true);
    expect(cached.filter((u) => u.startsWith('/api'))).toEqual([]);

    await context.setOffline(true);
    await page.reload();
    await page.getByTestId('scan-screen').waitFor({ timeout: 30_000 });
    expect(new URL(page.url()).pathname).toBe('/scan');
    await poll(() => page.getByTestId('connection').getAttribute('data-online')).toBe('false');
    // /me failed for want of a network, so the last person signed in on this phone is shown.
    expect(await page.getByTestId('operator').textContent()).toContain(user.name);
    await page.getByRole('button', { name: /^Cut\b/ }).click();
    expect(await wedgeScan(page, code)).toMatchObject({ outcome: 'kept' });
    await poll(() => page.getByTestId('pending-count').textContent()).toBe('1');
    await rig.screenshot(page, 'offline-shell-scan-kept-phone');
    expect(await cutsOf(code)).toEqual([]);

    await context.setOffline(false);
    await poll(() => page.getByTestId('pending-count').textContent()).toBe('0');
    expect(await page.getByTestId('sync-report').textContent()).toContain('1 recorded, 0 already there, 0 refused');
    await rig.screenshot(page, 'offline-shell-synced-phone');
    // A reload online sends nothing again.
    await page.reload();
    await page.getByTestId('scan-screen').waitFor();
    await poll(() => page.getByTestId('connection').getAttribute('data-online')).toBe('true');
    await page.waitForTimeout(500);
    await poll(() => page.getByTestId('pending-count').textContent()).toBe('0');
    expect((await cutsOf(code)).length).toBe(1);

    expect(fromWorker).toEqual([]);
    expect(await cachedUrls(page).then((urls) => urls.filter((u) => u.startsWith('/api')))).toEqual([]);
    await context.close();
  });

  it('sends a person whose session ended (401) to sign-in even with the shell cached, and forgets them on the device', async () => {
    const user = await createUser(rig.t, 'machinist');
    const { context, page } = await rig.newPage('phone');
    await openScanner(page, user.email, TEST_PASSWORD);
    await untilWorkerControls(page);
    expect(await page.evaluate(() => localStorage.getItem('halfmark.last-session'))).toContain(user.email);
    await context.clearCookies();
    await page.reload();
    await page.waitForURL((u) => u.pathname === '/sign-in', { timeout: 30_000 });
    expect(await page.evaluate(() => localStorage.getItem('halfmark.last-session'))).toBeNull();
    // Offline now, with nobody kept: the scanner does not open for a stranger.
    await context.setOffline(true);
    await page.goto('/scan');
    await page.getByRole('alert').waitFor({ timeout: 30_000 });
    expect(await page.getByTestId('scan-screen').count()).toBe(0);
    await context.close();
  });

  it('serves the worker and the manifest unhidden by caches, with our name, theme colours and icons', async () => {
    const { context, page } = await rig.newPage('phone');
    const sw = await page.request.get('/sw.js');
    expect(sw.status()).toBe(200);
    expect(sw.headers()['cache-control']).toBe('no-cache');
    expect(sw.headers()['content-type']).toMatch(/javascript/);
    // The worker leaves /api to the network: navigations there never get the shell.
    expect(await sw.text()).toContain('denylist:[/^\\/api(\\/|$)/]');

    const res = await page.request.get('/manifest.webmanifest');
    expect(res.headers()['cache-control']).toBe('no-cache');
    expect(res.headers()['content-type']).toMatch(/^application\/manifest\+json/);
    const manifest = (await res.json()) as { name: string; start_url: string; display: string; theme_color: string; background_color: string; icons: { src: string; sizes: string; type: string; purpose: string }[] };
    const { ink } = theme.theme.extend.colors;
    expect(manifest).toMatchObject({ name: 'Halfmark', start_url: '/scan', display: 'standalone', theme_color: ink[900], background_color: ink[50] });
    expect(manifest.icons.map((i) => i.purpose).sort()).toEqual(['any', 'any', 'maskable']);
    for (const icon of manifest.icons) {
      const file = await page.request.get(icon.src);
      expect(file.headers()['content-type']).toBe('image/png');
      const png = PNG.sync.read(await file.body());
      expect(`${png.width}x${png.height}`).toBe(icon.sizes);
    }

    const index = await page.request.get('/scan');
    expect(index.headers()['cache-control']).toBe('no-cache');
    const html = await index.text();
    expect(html).toContain('<link rel="manifest" href="/manifest.webmanifest">');
    // The registration is a module import, never an inline script the CSP would refuse.
    expect(html.match(/<script\b[^>]*>/g)?.every((tag) => / src="\/assets\//.test(tag))).toBe(true);
    const chunk = /src="(\/assets\/index-[\w-]+\.js)"/.exec(html)?.[1];
    expect((await page.request.get(chunk ?? '/missing')).headers()['cache-control']).toContain('immutable');
    await context.close();
  });
});

describe('a new version', { timeout: 180_000 }, () => {
  let dir: string;
  let server: Server;
  let baseUrl: string;
  let context: BrowserContext | null = null;
  beforeAll(async () => {
    // A copy of the build, so the test can "deploy" a new worker without touching dist/.
    dir = mkdtempSync(path.join(os.tmpdir(), 'halfmark-deploy-'));
    cpSync(path.resolve('dist'), dir, { recursive: true });
    const app = createApp(rig.t.ctx, { clientDir: dir });
    server = await new Promise<Server>((resolve) => {
      const s = app.listen(0, '127.0.0.1', () => resolve(s));
    });
    const addr = server.address();
    baseUrl = `http://127.0.0.1:${typeof addr === 'object' && addr ? addr.port : 0}`;
  });
  afterAll(async () => {
    await context?.close();
    await new Promise<void>((resolve) => server?.close(() => resolve()));
    server?.closeAllConnections();
    rmSync(dir, { recursive: true, force: true });
  });

  it('waits for the user to say "Reload now" instead of reloading mid-scan, then runs the new worker', async () => {
    const user = await createUser(rig.t, 'machinist');
    context = await rig.browser.newContext({ viewport: VIEWPORTS.phone, baseURL: baseUrl });
    const page = await context.newPage();
    await openScanner(page, user.email, TEST_PASSWORD);
    await untilWorkerControls(page);
    const firstWorker = await page.evaluate(async () => (await navigator.serviceWorker.ready).active?.scriptURL);
    expect(firstWorker).toBe(`${baseUrl}/sw.js`);

    // The deploy: a worker that differs by a byte is a new version to the browser.
    writeFileSync(path.join(dir, 'sw.js'), `${readFileSync(path.join(dir, 'sw.js'), 'utf8')}\n// build 2\n`);
    await page.reload();
    await page.getByTestId('scan-screen').waitFor();
    await page.getByTestId('app-update').waitFor({ timeout: 30_000 });
    // The page stays as it is until asked: a marker set now survives a pause.
    await page.evaluate(() => {
      (window as unknown as { hmMarker?: boolean }).hmMarker = true;
    });
    await page.waitForTimeout(1000);
    expect(await page.evaluate(() => (window as unknown as { hmMarker?: boolean }).hmMarker)).toBe(true);
    expect(await page.evaluate(async () => (await navigator.serviceWorker.getRegistration())?.waiting !== null)).toBe(true);
    await rig.screenshot(page, 'offline-shell-update-phone');

    await page.getByRole('button', { name: 'Reload now' }).click();
    await poll(() => page.evaluate(() => (window as unknown as { hmMarker?: boolean }).hmMarker ?? false).catch(() => true)).toBe(false);
    await page.getByTestId('scan-screen').waitFor();
    await poll(() => page.evaluate(async () => (await navigator.serviceWorker.getRegistration())?.waiting ?? null)).toBeNull();
    expect(await page.getByTestId('app-update').count()).toBe(0);
    expect(await page.evaluate(() => navigator.serviceWorker.controller?.state)).toBe('activated');
  });
});
