import { QueryTypes } from 'sequelize';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createUser, TEST_PASSWORD } from '../factories';
import { createSample, createSpecimen, managerActor } from '../ledger/ledger-fixtures';
import { startBrowserRig, type BrowserRig } from './browser';

describe('printing labels in chromium', () => {
  let rig: BrowserRig;
  let specimens: string[];

  beforeAll(async () => {
    rig = await startBrowserRig();
    const actor = await managerActor(rig.t);
    const { sampleId } = await createSample(rig.t);
    specimens = [];
    for (let i = 0; i < 3; i++) specimens.push(await createSpecimen(rig.t, actor, sampleId));
  });
  afterAll(() => rig?.close());

  async function signInAs(page: Page, role: 'technician' | 'manager'): Promise<number> {
    const user = await createUser(rig.t, role);
    await page.goto('/sign-in');
    await page.getByLabel('E-mail').fill(user.email);
    await page.getByLabel('Password').fill(TEST_PASSWORD);
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.waitForURL((u) => u.pathname === '/');
    return user.id;
  }

  async function printEvents(codes: readonly string[]): Promise<{ item_code: string; payload: { reprint: boolean; reason?: string } }[]> {
    return rig.t.owner.query(
      `SELECT item_code, payload FROM custody_events WHERE type = 'label_printed' AND item_code = ANY($1::text[]) ORDER BY id`,
      { bind: [codes], type: QueryTypes.SELECT },
    );
  }

  /**
   * Clicks the make button and waits for the server's PDF and for the preview frame to load its
   * blob: URL. The page's CSP keeps fetch() away from blob: URLs, so the bytes are read on their
   * way to the page, through a pass-through route.
   */
  async function makeAndPreview(page: Page, button: string): Promise<{ src: string; head: string; size: number }> {
    let body: Buffer | undefined;
    await page.route('**/api/labels', async (route) => {
      const response = await route.fetch();
      body = await response.body();
      await route.fulfill({ response, body });
    });
    await page.getByRole('button', { name: button }).click();
    const frame = page.getByTestId('label-preview');
    await frame.waitFor({ state: 'attached', timeout: 30_000 });
    await page.unroute('**/api/labels');
    const src = (await frame.getAttribute('src')) ?? '';
    await expect.poll(() => page.frames().some((f) => f.url() === src), { timeout: 10_000 }).toBe(true);
    await page.frames().find((f) => f.url() === src)?.waitForLoadState('load');
    const bytes = body ?? Buffer.alloc(0);
    return { src, head: bytes.subarray(0, 5).toString('latin1'), size: bytes.length };
  }

  it('prints a sheet for specimens ticked in the specimen list at desktop size, previews it, and asks a reason to print again', async () => {
    const { context, page } = await rig.newPage('desktop');
    const violations: string[] = [];
    // Expected error answers (401 before sign-in, the reprint's 422) log too; only CSP refusals count here.
    page.on('console', (m) => {
      if (m.type() === 'error' && m.text().includes('Content Security Policy')) violations.push(m.text());
    });
    await signInAs(page, 'technician');
    const [first, second] = specimens as [string, string, string];

    await page.goto('/specimens');
    await page.getByLabel(`Tick ${first} for labels`).check();
    await page.getByLabel(`Tick ${second} for labels`).check();
    await expect.poll(() => page.getByTestId('label-selection').textContent()).toContain('2 ticked');
    await rig.screenshot(page, 'labels-specimen-list-selection-desktop');
    await page.getByTestId('print-labels-link').click();
    await page.waitForURL((u) => u.pathname === '/labels');

    // Both codes arrive with their check characters confirmed.
    await expect.poll(() => page.getByTestId('label-code-lines').textContent()).toContain(`${first} · check character good`);
    expect(await page.getByTestId('label-code-lines').textContent()).toContain(`${second} · check character good`);
    await page.getByTestId('label-stock').selectOption('a4-3x8');
    await page.getByLabel('Start at position 4').click();
    const preview = await makeAndPreview(page, 'Make 2 labels');
    await expect.poll(() => page.getByTestId('label-result').textContent(), { timeout: 20_000 }).toContain('2 prints recorded in the ledger');
    expect(preview.src.startsWith('blob:')).toBe(true);
    expect(preview.head).toBe('%PDF-');
    expect(preview.size).toBeGreaterThan(1000);
    expect((await printEvents([first, second])).map((e) => [e.item_code, e.payload.reprint])).toEqual([
      [first, false],
      [second, false],
    ]);
    await rig.screenshot(page, 'labels-preview-desktop');

    // The same sheet again: the server asks why, beside the reason field.
    await page.getByRole('button', { name: 'Make 2 labels' }).click();
    await expect.poll(() => page.getByRole('alert').first().textContent()).toContain('had a label printed before');
    await page.getByTestId('reprint-reason').fill('Labels smudged by cutting fluid');
    await page.getByRole('button', { name: 'Make 2 labels' }).click();
    await expect.poll(() => page.getByTestId('label-result').textContent(), { timeout: 20_000 }).toContain(`Reprinted: ${first}, ${second}`);
    const events = await printEvents([first, second]);
    expect(events).toHaveLength(4);
    expect(events.slice(2).map((e) => e.payload)).toEqual([
      expect.objectContaining({ reprint: true, reason: 'Labels smudged by cutting fluid' }),
      expect.objectContaining({ reprint: true, reason: 'Labels smudged by cutting fluid' }),
    ]);
    await rig.screenshot(page, 'labels-reprint-desktop');
    expect(violations).toEqual([]);
    await context.close();
  }, 120_000);

  it('checks each code as it is typed on a phone, and shows the server naming an unknown code', async () => {
    const { context, page } = await rig.newPage('phone');
    await signInAs(page, 'technician');
    const third = specimens[2] as string;
    const wrong = third.slice(0, -1) + (third.endsWith('0') ? '1' : '0');
    await page.goto(`/labels?kind=specimen&codes=${encodeURIComponent(third)}`);
    await page.getByTestId('label-codes').press('End');
    await page.getByTestId('label-codes').pressSequentially(`\n${wrong}`);
    await expect.poll(() => page.getByTestId('label-code-lines').textContent()).toContain('check character does not match');
    expect(await page.getByRole('button', { name: /Make/ }).isDisabled()).toBe(true);
    await rig.screenshot(page, 'labels-check-character-phone');

    // A well-formed code nobody registered: the page checks its shape, the server says it is unknown.
    const { specimenCode } = await import('../../shared/domain/codes');
    await page.getByTestId('label-codes').fill(`${third}\n${specimenCode(26, 99_999_999)}`);
    await page.getByRole('button', { name: 'Make 2 labels' }).click();
    await expect.poll(() => page.getByRole('alert').first().textContent()).toContain('No item has the code');
    expect(await printEvents([third])).toEqual([]);
    await rig.screenshot(page, 'labels-unknown-code-phone');
    await context.close();
  }, 60_000);

  it('offers badge cards to a manager only, and previews a roll of them on a phone', async () => {
    const { context, page } = await rig.newPage('phone');
    const id = await signInAs(page, 'manager');
    const { badgeCode } = await import('../../shared/domain/codes');
    const code = badgeCode();
    await rig.t.sequelize.query('UPDATE users SET badge_code = $1 WHERE id = $2', { bind: [code, id] });
    await page.goto(`/labels?kind=badge&codes=${encodeURIComponent(code)}`);
    await page.getByTestId('label-stock').selectOption('roll-57x32');
    expect((await makeAndPreview(page, 'Make 1 label')).head).toBe('%PDF-');
    await expect.poll(() => page.getByTestId('label-result').textContent(), { timeout: 20_000 }).toContain('nothing was recorded');
    await rig.screenshot(page, 'labels-badge-preview-phone');
    await context.close();
  }, 60_000);
});
