import { QueryTypes } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { badgeCode, halfCode, specimenCode } from '../../shared/domain/codes';
import { hashPassword } from '../../server/auth/passwords';
import type { LedgerActor } from '../../server/ledger/types';
import { openScanner, wedgeScan, type ScanBrowser } from '../../scripts/bench-scan';
import { createUser, TEST_PASSWORD } from '../factories';
import { patientPoll as poll } from './browser';
import { createContainer, createSpecimen, createStation, FLAT_READINGS, scan } from '../ledger/ledger-fixtures';
import { recordEvent } from '../../server/commands/record-event';
import type { TestContext } from '../support';
import { closeScannerRig, startScannerRig } from './scan-rig';

let t: TestContext;
let rig: ScanBrowser;
let actor: LedgerActor;
let sampleId: number;

beforeAll(async () => {
  ({ t, rig, actor, sampleId } = await startScannerRig());
});
afterAll(() => closeScannerRig({ t, rig }));

/** A registered specimen, moved on through the given events first. */
async function specimenAt(...steps: [string, Record<string, unknown>?][]): Promise<string> {
  const code = await createSpecimen(t, actor, sampleId);
  for (const [type, extra] of steps) await recordEvent(t.ctx, scan(type, code, extra ?? {}), { actor });
  return code;
}

async function events(where: string, bind: unknown[]): Promise<{ type: string; item_code: string; actor_user_id: number | null; station_code: string | null; container_code: string | null; payload: Record<string, unknown> }[]> {
  return t.sequelize.query(`SELECT type, item_code, actor_user_id, station_code, container_code, payload FROM custody_events WHERE ${where} ORDER BY id`, {
    bind,
    type: QueryTypes.SELECT,
  });
}

async function choose(page: Page, label: RegExp): Promise<void> {
  await page.getByRole('button', { name: label }).click();
}

const title = (page: Page) => page.getByTestId('scan-title').textContent();
const message = (page: Page) => page.getByTestId('scan-message').textContent();

for (const viewport of ['phone', 'desktop'] as const) {
  describe(`the scanner at ${viewport} size`, { timeout: 120_000 }, () => {
    it('records a wedge scan with a check in a circle, counts a double scan once, and answers a repeat as already recorded', async () => {
      const user = await createUser(t, 'machinist');
      const { context, page } = await rig.newPage(viewport);
      await openScanner(page, user.email, TEST_PASSWORD);
      await choose(page, /^Cut\b/);
      // The saw's caution is beside the action, deferring to the lab's procedures.
      expect(await page.getByTestId('safety-note').textContent()).toContain("Follow your lab's procedures for the saw; Halfmark does not control machines.");
      const code = await specimenAt();

      const first = await wedgeScan(page, code);
      expect(first.outcome).toBe('accepted');
      const result = page.getByTestId('scan-result');
      expect(await result.locator('svg[data-shape]').first().getAttribute('data-shape')).toBe('check-circle');
      expect(await result.getAttribute('data-feedback')).toBe('chirp');
      expect(await title(page)).toBe('Cut');
      await poll(() => page.getByTestId('scan-details').textContent()).toMatch(/Heat\s*H-/);
      await rig.screenshot(page, `scan-accepted-${viewport}`);

      // A scanner firing twice: the same code twice within a few milliseconds.
      const doubled = await specimenAt();
      const before = await result.getAttribute('data-serial');
      await page.evaluate((c) => {
        const fire = (key: string) => document.body.dispatchEvent(new KeyboardEvent('keydown', { key, bubbles: true }));
        for (let i = 0; i < 2; i++) {
          for (const ch of c) fire(ch);
          fire('Enter');
        }
      }, doubled);
      await poll(() => message(page)).toContain('scanned twice within a second and counts once');
      expect(Number(await result.getAttribute('data-serial'))).toBe(Number(before) + 1);
      expect((await events('item_code = $1 AND type = $2', [doubled, 'cut'])).length).toBe(1);

      const again = await wedgeScan(page, code);
      expect(again.outcome).toBe('already');
      expect(await title(page)).toBe('Already recorded');
      expect(await message(page)).toContain('already cut');
      expect(await result.locator('svg[data-shape]').first().getAttribute('data-shape')).toBe('double-ring');
      expect(await result.getAttribute('data-feedback')).toBe('double');
      expect((await events('item_code = $1 AND type = $2', [code, 'cut'])).length).toBe(1);
      await context.close();
    });

    it('refuses with a triangle, the state and what may come next; and answers bad codes without recording', async () => {
      const user = await createUser(t, 'technician');
      const { context, page } = await rig.newPage(viewport);
      await openScanner(page, user.email, TEST_PASSWORD);
      await choose(page, /Out of conditioning/);
      const code = await specimenAt(['cut']);
      const refused = await wedgeScan(page, code);
      expect(refused.outcome).toBe('refused');
      const result = page.getByTestId('scan-result');
      expect(await result.locator('svg[data-shape]').first().getAttribute('data-shape')).toBe('triangle-bang');
      expect(await result.getAttribute('data-feedback')).toBe('buzz');
      expect(await message(page)).toContain(`${code} is cut`);
      expect(await page.getByTestId('scan-next').textContent()).toMatch(/into conditioning.*measure/);
      await rig.screenshot(page, `scan-refused-${viewport}`);

      // A container where a specimen is expected.
      const bin = await createContainer(t, actor, 'bin');
      await wedgeScan(page, bin);
      expect(await title(page)).toBe('Wrong kind of code');

      // A code no one registered.
      const unknown = specimenCode(26, 987_654);
      await wedgeScan(page, unknown);
      expect(await title(page)).toBe('Unknown code');

      // Typed by hand with a slip in the check character: flagged while typing, refused on Enter.
      const typed = page.getByLabel('Type a code');
      const wrong = code.slice(0, -1) + (code.endsWith('7') ? '8' : '7');
      await typed.pressSequentially(wrong, { delay: 90 });
      await poll(() => page.getByTestId('typed-code-check').getAttribute('data-tone')).toBe('bad');
      await rig.screenshot(page, `scan-typed-check-${viewport}`);
      await typed.press('Enter');
      await poll(() => title(page)).toBe('Check character wrong');
      await typed.pressSequentially(code.toLowerCase(), { delay: 90 });
      await poll(() => page.getByTestId('typed-code-check').getAttribute('data-tone')).toBe('good');

      expect(await events('item_code = ANY($1) AND type = $2', [[code, bin, unknown], 'conditioned'])).toEqual([]);
      await context.close();
    });

    it('measures with three readings per dimension, minimum and area as typed, a flag and a reason for out of tolerance', async () => {
      const user = await createUser(t, 'technician');
      const { context, page } = await rig.newPage(viewport);
      await openScanner(page, user.email, TEST_PASSWORD);
      await choose(page, /^Measure\b/);
      const code = await specimenAt(['cut']);
      await page.keyboard.type(code);
      await page.keyboard.press('Enter');
      const form = page.getByTestId('measure-form');
      await form.waitFor();
      const fill = async (dimension: string, values: readonly string[]) => {
        for (const [i, v] of values.entries()) await page.getByLabel(`${dimension} ${i + 1}`, { exact: true }).fill(v);
      };
      await fill('Width', ['12.50', '12.52', 'abc']);
      expect(await form.textContent()).toContain('Enter the reading as a number of millimetres');
      await fill('Width', ['12.50', '12.52', '12.93']);
      await fill('Thickness', ['2.01', '2.00', '2.02']);
      // Minima by inspection; area 12.50 mm × 2.00 mm = 25.0000 mm² (min-dimensions, common practice).
      expect(await page.getByTestId('min-width').textContent()).toContain('12.50');
      expect(await page.getByTestId('min-thickness').textContent()).toContain('2.00');
      expect(await page.getByTestId('area').textContent()).toContain('25.0000 mm²');
      // 12.93 mm lies above the sheet-type 12.5 ± 0.2 mm width (ASTM E8/E8M, from the geometry table).
      expect(await page.getByTestId('tolerance-flag').count()).toBe(1);
      await rig.screenshot(page, `scan-measure-${viewport}`);
      await page.getByRole('button', { name: 'Record measurement' }).click();
      expect(await form.getByRole('alert').first().textContent()).toContain('Give a reason');
      await page.getByLabel('Reason for out-of-tolerance readings').fill('Edge burr; customer accepts');
      await page.getByRole('button', { name: 'Record measurement' }).click();
      await poll(() => page.getByTestId('scan-result').getAttribute('data-outcome')).toBe('accepted');
      expect(await page.getByTestId('scan-result').textContent()).toContain('Out of tolerance');
      const [measured] = await events('item_code = $1 AND type = $2', [code, 'measured']);
      expect(measured?.payload).toMatchObject({ width: ['12.50', '12.52', '12.93'], outOfToleranceReason: 'Edge burr; customer accepts' });
      await context.close();
    });

    it('asks broken or unbroken after a test, with the frame caution, and offers the half-B label at once', async () => {
      const user = await createUser(t, 'technician');
      const { context, page } = await rig.newPage(viewport);
      await openScanner(page, user.email, TEST_PASSWORD);
      await choose(page, /^Tested\b/);
      expect(await page.getByTestId('safety-note').first().textContent()).toContain("Follow your lab's procedures for the frame; Halfmark does not control machines.");
      const code = await specimenAt(['cut'], ['measured', { payload: FLAT_READINGS }]);
      await page.keyboard.type(code);
      await page.keyboard.press('Enter');
      await page.getByTestId('test-prompt').waitFor();
      await rig.screenshot(page, `scan-test-prompt-${viewport}`);
      await page.getByRole('button', { name: /Broken in two/ }).click();
      const link = page.getByTestId('half-b-label');
      await link.waitFor();
      expect(await link.getAttribute('href')).toBe(`/labels?kind=half&codes=${encodeURIComponent(halfCode(code, 'B'))}`);
      expect(await page.getByTestId('scan-result').textContent()).toContain('broken');
      await rig.screenshot(page, `scan-tested-${viewport}`);
      await context.close();
    });

    it('bins many pieces into a container scanned first', async () => {
      const user = await createUser(t, 'clerk');
      const { context, page } = await rig.newPage(viewport);
      await openScanner(page, user.email, TEST_PASSWORD);
      await choose(page, /Into a bin/);
      const pieces = [
        await specimenAt(['cut'], ['measured', { payload: FLAT_READINGS }], ['tested', { payload: { fractured: false } }]),
        await specimenAt(['cut'], ['measured', { payload: FLAT_READINGS }], ['tested', { payload: { fractured: false } }]),
      ];
      await wedgeScan(page, pieces[0] ?? '');
      expect(await title(page)).toBe('Scan the container first');
      const bin = await createContainer(t, actor, 'bin');
      expect(await wedgeScan(page, bin)).toMatchObject({ outcome: 'info' });
      expect(await page.getByTestId('target-container').textContent()).toContain(bin);
      for (const piece of pieces) expect(await wedgeScan(page, piece)).toMatchObject({ outcome: 'accepted' });
      await rig.screenshot(page, `scan-batch-bin-${viewport}`);
      const rows = await events('item_code = ANY($1) AND type = $2', [pieces, 'binned']);
      expect(rows.map((r) => r.container_code)).toEqual([bin, bin]);
      await context.close();
    });
  });
}

describe('a fixed, shared station', { timeout: 120_000 }, () => {
  it('remembers its station and action across reloads and sends the station code with each scan', async () => {
    const station = await createStation(t, `SAW-${Date.now() % 100000}`, 'saw');
    const user = await createUser(t, 'machinist');
    const { context, page } = await rig.newPage('phone');
    await openScanner(page, user.email, TEST_PASSWORD);
    await page.getByText('Set up a fixed station').click();
    await page.getByLabel('Station code').fill(station.code.toLowerCase());
    await page.getByLabel('Action').selectOption('cut');
    await page.getByRole('button', { name: 'Use this station' }).click();
    await page.reload();
    expect(await page.getByTestId('station-mode').textContent()).toContain(`${station.code} · Cut`);
    const code = await specimenAt();
    expect(await wedgeScan(page, code)).toMatchObject({ outcome: 'accepted' });
    expect((await events('item_code = $1', [code])).at(-1)?.station_code).toBe(station.code);
    await rig.screenshot(page, 'scan-station-mode-phone');
    await context.close();
  });

  it('switches operator by badge and PIN; the next scans are theirs; a wrong PIN switches no one', async () => {
    const tablet = await createUser(t, 'technician');
    const operator = await createUser(t, 'machinist');
    const badge = badgeCode();
    await operator.update({ badgeCode: badge, pinHash: await hashPassword('2468') });
    const { context, page } = await rig.newPage('desktop');
    await openScanner(page, tablet.email, TEST_PASSWORD);
    await choose(page, /^Cut\b/);

    await page.keyboard.type(badge);
    await page.keyboard.press('Enter');
    await page.getByTestId('pin-prompt').waitFor();
    expect(await page.getByTestId('pin-prompt').textContent()).toContain(operator.name);
    await page.getByLabel('PIN').fill('1357');
    await page.getByRole('button', { name: 'Switch' }).click();
    await poll(() => page.getByTestId('pin-prompt').getByRole('alert').textContent()).toContain('do not belong together');
    await page.getByLabel('PIN').fill('2468');
    await page.getByRole('button', { name: 'Switch' }).click();
    await poll(() => page.getByTestId('operator').textContent()).toContain(operator.name);
    await rig.screenshot(page, 'scan-operator-switched-desktop');

    const code = await specimenAt();
    expect(await wedgeScan(page, code)).toMatchObject({ outcome: 'accepted' });
    expect((await events('item_code = $1 AND type = $2', [code, 'cut']))[0]?.actor_user_id).toBe(operator.id);

    await page.getByRole('button', { name: 'End shift here' }).click();
    const next = await specimenAt();
    expect(await wedgeScan(page, next)).toMatchObject({ outcome: 'accepted' });
    expect((await events('item_code = $1 AND type = $2', [next, 'cut']))[0]?.actor_user_id).toBe(tablet.id);
    await context.close();
  });

  it('takes a wedge scan while the typing field has the focus, and gives the field its text back', async () => {
    const user = await createUser(t, 'machinist');
    const { context, page } = await rig.newPage('phone');
    await openScanner(page, user.email, TEST_PASSWORD);
    await choose(page, /^Cut\b/);
    const typed = page.getByLabel('Type a code');
    await typed.click();
    await typed.pressSequentially('S2', { delay: 120 });
    const code = await specimenAt();
    expect(await wedgeScan(page, code)).toMatchObject({ outcome: 'accepted' });
    expect(await typed.inputValue()).toBe('S2');
    await context.close();
  });
});

describe('who may scan', { timeout: 120_000 }, () => {
  it('tells an auditor, who may not record events, instead of offering the scanner', async () => {
    const user = await createUser(t, 'auditor');
    const { context, page } = await rig.newPage('phone');
    await page.goto('/sign-in?next=%2Fscan');
    await page.getByLabel('E-mail').fill(user.email);
    await page.getByLabel('Password').fill(TEST_PASSWORD);
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.waitForURL((u) => u.pathname === '/scan');
    await poll(() => page.getByTestId('scan-not-allowed').textContent()).toContain('may look things up but not record');
    expect(await page.getByTestId('scan-screen').count()).toBe(0);
    await context.close();
  });
});
