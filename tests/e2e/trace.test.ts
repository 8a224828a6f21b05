import { PNG } from 'pngjs';
import type { Page } from 'playwright-core';
import { getGeometry } from '../../shared/domain/specimen-geometries';
import type { Role } from '../../shared/permissions';
import { nominalFor } from '../../shared/schemas/specimens';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createUser, signedInAs, TEST_PASSWORD } from '../factories';
import { buildLife, type Life } from '../api/trace-fixtures';
import { startBrowserRig, type BrowserRig } from './browser';

async function signInAuditor(rig: BrowserRig, page: Page): Promise<void> {
  await signInAs(rig, page, 'auditor');
}

async function signInAs(rig: BrowserRig, page: Page, role: Role): Promise<void> {
  const user = await createUser(rig.t, role);
  await page.goto('/sign-in');
  await page.getByLabel('E-mail').fill(user.email);
  await page.getByLabel('Password').fill(TEST_PASSWORD);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.waitForURL((u) => u.pathname === '/');
}

/** A small grey picture, as a stand-in fracture photo; another height gives other bytes. */
function photo(height = 48): Buffer {
  const png = new PNG({ width: 64, height });
  for (let i = 0; i < png.data.length; i += 4) {
    png.data[i] = png.data[i + 1] = png.data[i + 2] = (i / 4) % 64 < 32 ? 90 : 170;
    png.data[i + 3] = 255;
  }
  return PNG.sync.write(png);
}

describe('trace in chromium', () => {
  let rig: BrowserRig;
  let life: Life;
  beforeAll(async () => {
    rig = await startBrowserRig();
    life = await buildLife(rig.t);
    const tech = await signedInAs(rig.t, 'technician');
    await tech.post('/api/attachments').field('itemCode', life.halfA).field('note', 'fracture face').attach('file', photo(), 'fracture-face.png').expect(201);
  });
  afterAll(() => rig?.close());

  it('traces a half typed into the search box back to its order, shows its photo and opens its audit PDF (desktop)', async () => {
    const { context, page } = await rig.newPage('desktop');
    await signInAuditor(rig, page);
    // Console errors from here on (the sign-in page asks /auth/me first and is told 401).
    const errors: string[] = [];
    page.on('console', (m) => {
      if (m.type() === 'error') errors.push(m.text());
    });
    await page.getByRole('navigation', { name: 'Main' }).first().getByRole('link', { name: 'Trace' }).click();
    await page.waitForURL(/\/trace$/);

    // A wrong check character is named as it is typed.
    const box = page.getByTestId('search-input');
    const wrong = life.halfA.slice(0, -1) + (life.halfA.endsWith('A') ? 'B' : 'A');
    await box.pressSequentially(wrong, { delay: 15 });
    await expect.poll(() => page.getByTestId('search-status').textContent()).toContain('check character does not match');
    await box.fill('');
    await box.pressSequentially(life.halfA, { delay: 15 });
    await expect.poll(() => page.getByTestId('search-status').textContent()).toContain(`Check character good: ${life.halfA}`);
    await box.press('Enter');
    await page.waitForURL((u) => u.pathname === `/trace/${encodeURIComponent(life.halfA)}`);

    await expect.poll(() => page.getByRole('heading', { level: 1 }).textContent(), { timeout: 10_000 }).toBe(life.halfA);
    const verdict = page.getByTestId('chain-verdict');
    await expect.poll(() => verdict.textContent()).toContain('Chain intact: 2 of 2 verified');
    expect(await verdict.getAttribute('data-ok')).toBe('true');
    const body = await page.locator('main').textContent();
    expect(body).toContain(life.orderNumber);
    expect(body).toContain(life.heatNumber);
    expect(body).toContain(life.sampleCode);
    expect(body).toContain(life.specimen);
    expect(await page.getByTestId('trace-location').textContent()).toContain(life.bag);
    const steps = await page.getByTestId('timeline').locator('li[data-type]').evaluateAll((els) => els.map((e) => e.getAttribute('data-type')));
    expect(steps).toEqual(['registered', 'cut', 'measured', 'tested', 'split_from', 'binned', 'retained', 'attached']);
    // The photo shows.
    const img = page.getByTestId('attachment').locator('img');
    await expect.poll(() => img.evaluate((el) => (el as HTMLImageElement).naturalWidth), { timeout: 10_000 }).toBe(64);
    await rig.screenshot(page, 'trace-half-desktop');

    // Back to its order, through the genealogy.
    const orderLink = page.getByRole('link', { name: life.orderNumber });
    expect(await orderLink.getAttribute('href')).toBe(`/orders/${life.orderId}`);

    // The audit PDF opens in a new tab.
    const [response] = await Promise.all([
      context.waitForEvent('response', (r) => r.url().includes(`/api/items/${encodeURIComponent(life.halfA)}/audit.pdf`) || r.url().includes(`/api/items/${life.halfA}/audit.pdf`)),
      page.getByTestId('audit-pdf').click(),
    ]);
    expect(response.status()).toBe(200);
    expect(response.headers()['content-type']).toBe('application/pdf');
    // Chromium hands its PDF viewer to the tab, so read the file itself through the same session.
    const href = await page.getByTestId('audit-pdf').getAttribute('href');
    const pdf = await (await page.request.get(href ?? '')).body();
    expect(pdf.subarray(0, 5).toString('latin1')).toBe('%PDF-');
    expect(errors).toEqual([]);
    await context.close();
  });

  it('attaches a photo through the item page as a technician, and shows the server refusing a file that is not what it claims', async () => {
    const { context, page } = await rig.newPage('desktop');
    await signInAs(rig, page, 'technician');
    await page.goto(`/trace/${encodeURIComponent(life.halfB)}`);
    await expect.poll(() => page.getByRole('heading', { level: 1 }).textContent(), { timeout: 10_000 }).toBe(life.halfB);
    expect(await page.getByTestId('attachment').count()).toBe(0);
    const form = page.getByTestId('attachment-upload');

    // Text named .png: the server checks the first bytes against the PNG signature and says no (415).
    await form.getByLabel('File').setInputFiles({ name: 'not-a-photo.png', mimeType: 'image/png', buffer: Buffer.from('just some words, not a picture\n') });
    await form.getByRole('button', { name: 'Attach' }).click();
    await expect.poll(() => form.getByTestId('attachment-upload-error').textContent(), { timeout: 10_000 }).toContain('does not look like image/png');
    expect(await page.getByTestId('attachment').count()).toBe(0);

    await form.getByLabel('File').setInputFiles({ name: 'half-b-face.png', mimeType: 'image/png', buffer: photo(40) });
    expect(await form.getByLabel('Kind').inputValue()).toBe('photo');
    await form.getByLabel('Note').fill('fracture face, half B');
    await form.getByRole('button', { name: 'Attach' }).click();
    await expect.poll(() => form.getByTestId('attachment-upload-done').textContent(), { timeout: 10_000 }).toContain('Attached half-b-face.png');
    const listed = page.getByTestId('attachment');
    await expect.poll(() => listed.count(), { timeout: 10_000 }).toBe(1);
    expect(await listed.textContent()).toContain('half-b-face.png');
    expect(await listed.textContent()).toContain('fracture face, half B');
    await expect.poll(() => listed.locator('img').evaluate((el) => (el as HTMLImageElement).naturalHeight), { timeout: 10_000 }).toBe(40);
    const steps = await page.getByTestId('timeline').locator('li[data-type]').evaluateAll((els) => els.map((e) => e.getAttribute('data-type')));
    expect(steps.at(-1)).toBe('attached');
    await rig.screenshot(page, 'trace-attach-desktop');

    // The auditor reads the trace but may not record events, so no form shows.
    const auditor = await rig.newPage('desktop');
    await signInAuditor(rig, auditor.page);
    await auditor.page.goto(`/trace/${encodeURIComponent(life.halfB)}`);
    await expect.poll(() => auditor.page.getByTestId('attachment').count(), { timeout: 10_000 }).toBe(1);
    expect(await auditor.page.getByTestId('attachment-upload').count()).toBe(0);
    await auditor.context.close();
    await context.close();
  });

  it('leads from the specimen page to its trace and its results (phone)', async () => {
    const { context, page } = await rig.newPage('phone');
    await signInAuditor(rig, page);
    // The ledger fixture registers the specimen with empty nominal sizes; intake stores them from the geometry, so do the same here.
    const geometry = getGeometry('astm-e8-flat-sheet-12.5');
    if (!geometry) throw new Error('the fixture geometry is gone');
    await rig.t.owner.query(`UPDATE specimens SET nominal = $2 WHERE item_id = (SELECT id FROM items WHERE code = $1)`, {
      bind: [life.specimen, JSON.stringify(nominalFor(geometry, null))],
    });
    await page.goto(`/specimens/${encodeURIComponent(life.specimen)}`);
    await expect.poll(() => page.getByRole('heading', { level: 1 }).textContent(), { timeout: 15_000 }).toBe(life.specimen);
    await rig.screenshot(page, 'specimen-links-phone');
    expect(await page.getByTestId('specimen-trace-link').getAttribute('href')).toBe(`/trace/${encodeURIComponent(life.specimen)}`);
    expect(await page.getByTestId('specimen-results-link').getAttribute('href')).toBe(`/results/specimens/${encodeURIComponent(life.specimen)}`);
    await page.getByTestId('specimen-trace-link').click();
    await page.waitForURL((u) => u.pathname === `/trace/${encodeURIComponent(life.specimen)}`);
    await expect.poll(() => page.getByTestId('chain-verdict').textContent(), { timeout: 15_000 }).toContain('Chain intact');
    await context.close();
  });

  it('shows the trace and the anomaly list on a phone', async () => {
    const { context, page } = await rig.newPage('phone');
    await signInAuditor(rig, page);
    await page.goto(`/trace/${encodeURIComponent(life.specimen)}`);
    await expect.poll(() => page.getByTestId('chain-verdict').textContent(), { timeout: 10_000 }).toContain('Chain intact: 3 of 3 verified');
    await rig.screenshot(page, 'trace-specimen-phone');
    await page.goto('/anomalies');
    await expect.poll(() => page.getByRole('heading', { level: 1 }).textContent()).toBe('Anomalies');
    await expect.poll(() => page.locator('main').textContent(), { timeout: 10_000 }).toMatch(/items checked/);
    await rig.screenshot(page, 'anomalies-phone');
    await context.close();
  });
});
