import { test, expect, type Locator, type Page } from '@playwright/test';
import { expectAccessible, signIn, snap } from './support';

const tablet = { viewport: { width: 800, height: 1280 }, hasTouch: true, isMobile: true };

/** Counts every tap so the test can hold the common change to three. */
function tapper() {
  let taps = 0;
  return {
    tap: async (l: Locator) => {
      taps++;
      await l.tap();
    },
    get count() {
      return taps;
    },
  };
}

const onHandOf = async (item: Locator) => Number((await item.innerText()).match(/(\d+) pcs? in stock/)![1]);

test.describe('station page on a tablet', () => {
  test.use(tablet);

  test('operator logs an electrode and nozzle change in three taps; life bars restart and stock drops', async ({ page }) => {
    await signIn(page, 'operator@alder-row.example');
    const t0 = Date.now();
    await page.goto('/station/C1');
    const logButton = page.getByRole('button', { name: 'Log a change' });
    await expect(logButton).toBeVisible();
    test.info().annotations.push({ type: 'station page ready (ms)', description: String(Date.now() - t0) });

    const torch = page.getByRole('region', { name: 'Torch C1-T' });
    const electrode = torch.getByRole('listitem').filter({ hasText: 'Electrode' });
    const nozzle = torch.getByRole('listitem').filter({ hasText: 'Nozzle' });
    const electrodeStock = await onHandOf(electrode);
    const nozzleStock = await onHandOf(nozzle);
    // Parts in the torch have worn for a while: their bars are not at zero.
    await expect(electrode.getByRole('meter')).not.toHaveAttribute('aria-valuenow', '0');
    await expectAccessible(page, 'station page');
    await snap(page, 'station-tablet');

    const taps = tapper();
    await taps.tap(logButton);
    await expect(page.getByText('Before opening the torch: switch off and lock out the plasma power source')).toBeVisible();
    await expectAccessible(page, 'change sheet');
    await snap(page, 'station-change-sheet');
    await taps.tap(page.getByRole('button', { name: 'Electrode + nozzle' }));
    await taps.tap(page.getByRole('button', { name: 'Record the change' }));
    await expect(page.getByRole('status').filter({ hasText: 'Change recorded on C1-T: electrode (worn) and nozzle (with its partner).' })).toBeVisible();
    expect(taps.count).toBe(3);

    await expect(electrode.getByRole('meter')).toHaveAttribute('aria-valuenow', '0');
    await expect(nozzle.getByRole('meter')).toHaveAttribute('aria-valuenow', '0');
    await expect(electrode.getByText(/^0 of 1,000 arc starts \(0 %\)$/)).toBeVisible();
    await expect.poll(() => onHandOf(electrode)).toBe(electrodeStock - 1);
    await expect.poll(() => onHandOf(nozzle)).toBe(nozzleStock - 1);
    await expect(page.getByRole('table', { name: 'Recent consumable changes' }).getByRole('row').nth(1)).toContainText('Electrode, Nozzle');
    await snap(page, 'station-after-change');

    // A test coupon out of tolerance with the new parts: the page says so and suggests a change.
    await page.getByText('Record a test coupon').tap();
    await page.getByLabel('Dimension 1 measured in mm').fill('100.05');
    await page.getByLabel('Dimension 2 measured in mm').fill('50.26');
    await page.getByLabel('Dimension 3 measured in mm').fill('19.98');
    await page.getByRole('button', { name: 'Record the coupon' }).tap();
    await expect(page.getByRole('status').filter({ hasText: 'Out of tolerance — consider a consumable change' })).toContainText(
      'Largest deviation 0.26 mm against ±0.2 mm',
    );
    await expect(torch.getByRole('alert').filter({ hasText: 'Cut quality out of tolerance' })).toBeVisible();
    await expectAccessible(page, 'station after a failed coupon');
  });

  test('operator records counters at the station; a lower count is refused and the good reading beside it kept', async ({ page }) => {
    await signIn(page, 'operator@alder-row.example');
    await page.goto('/station/P1');
    await expect(page.getByRole('heading', { name: 'Due on P1' })).toBeVisible();
    await page.getByRole('button', { name: 'Record counters' }).tap();
    const starts = page.getByLabel('P1-T · Arc starts (starts)');
    const hint = page.locator(`#${await starts.getAttribute('id')}-hint`);
    const last = Number((await hint.innerText()).replace(/[^0-9]/g, ''));
    await starts.fill(String(last - 10));
    await page.getByLabel('P1-T · Arc hours (h)').fill('99999');
    await page.getByRole('button', { name: 'Record 2 readings' }).tap();
    await expect(
      page.getByRole('status').filter({ hasText: 'Recorded 1 reading: P1-T · Arc hours. Not recorded: P1-T · Arc starts (see the field).' }),
    ).toBeVisible();
    await expect(
      page
        .getByRole('alert')
        .filter({ hasText: `${(last - 10).toLocaleString('en-US')} starts is lower than the reading before it (${last.toLocaleString('en-US')} starts` }),
    ).toBeVisible();
    // The kept reading left its field; the refused one stays for the operator to correct.
    await expect(page.getByLabel('P1-T · Arc hours (h)')).toHaveValue('');
    await expect(page.locator(`#${await page.getByLabel('P1-T · Arc hours (h)').getAttribute('id')}-hint`)).toHaveText('Last 99,999 h');
    await starts.fill(String(last + 25));
    await page.getByRole('button', { name: 'Record 1 reading' }).tap();
    await expect(page.getByRole('status').filter({ hasText: 'Recorded 1 reading: P1-T · Arc starts.' })).toBeVisible();
    await expect(page.getByRole('region', { name: 'Torch P1-T' })).toContainText(`${(last + 25).toLocaleString('en-US')} starts`);
    await expectAccessible(page, 'station counters');

    // The control was reset: a low count goes in once the operator says so.
    await starts.fill('5');
    await page.locator(`#${await starts.getAttribute('id')}-reset`).check();
    await page.getByRole('button', { name: 'Record 1 reading' }).tap();
    await expect(page.getByRole('status').filter({ hasText: 'Recorded 1 reading: P1-T · Arc starts.' })).toBeVisible();
    await expect(hint).toHaveText('Last 5 starts');
  });

  test('when the database does not answer, the operator is told the entry was not saved and to try again', async ({ page }) => {
    await signIn(page, 'operator@alder-row.example');
    await page.goto('/station/P1');
    await page.getByRole('button', { name: 'Record counters' }).tap();
    const starts = page.getByLabel('P1-T · Arc starts (starts)');
    const hint = page.locator(`#${await starts.getAttribute('id')}-hint`);
    const before = await hint.innerText();
    // The server's own 503 answer is covered by tests/server/db-restart.test.ts; here the screen's reading of it.
    await page.route('**/api/meter-readings', (route) =>
      route.fulfill({ status: 503, json: { error: 'database_unavailable', message: 'The database is unavailable right now. Try again in a moment.' } }),
    );
    await starts.fill('123456789');
    await page.getByRole('button', { name: 'Record 1 reading' }).tap();
    await expect(
      page.getByRole('status').filter({ hasText: 'Nothing recorded. The database is not answering; your entry was not saved, try again in a moment.' }),
    ).toBeVisible();
    await expect(hint).toHaveText(before);
    await snap(page, 'station-database-unavailable');
  });

  test('a punch tool far past its sharpening interval is overdue, not just due', async ({ page }) => {
    await signIn(page, 'operator@alder-row.example');
    // Fix the tool wear in the answer so the page's thresholds are what is tested.
    await page.route('**/api/stations/P1', async (route) => {
      const res = await route.fetch();
      const body = await res.json();
      const tool = (id: string, hits: number) => ({
        id,
        code: `T-${id}`,
        name: `Round ${id}`,
        stationSize: 'B',
        hitsSince: hits,
        interval: 10_000,
        fraction: hits / 10_000,
        due: hits >= 10_000,
      });
      body.tools = [tool('ok', 5_000), tool('due', 11_900), tool('over', 12_000)];
      await route.fulfill({ response: res, json: body });
    });
    await page.goto('/station/P1');
    const tools = page.getByRole('list', { name: 'Punch tools' });
    const item = (code: string) => tools.getByRole('listitem').filter({ hasText: code });
    await expect(item('T-over')).toContainText('Sharpening overdue');
    await expect(item('T-over')).toContainText('12,000 of 10,000 hits since sharpening (120 %)');
    await expect(item('T-due')).toContainText('Sharpening due');
    await expect(item('T-due')).not.toContainText('overdue');
    await expect(item('T-ok')).not.toContainText('Sharpening');
    await expect(tools.getByRole('listitem').first()).toContainText('T-over');
    await expectAccessible(page, 'station punch tools');
  });

  test('an applied lockout tops the page in red, and open work links to its work order', async ({ page }) => {
    await signIn(page, 'operator@alder-row.example');
    const due = (await (await page.request.get('/api/stations/C1')).json()).due as { id: string; number: number; title: string }[];
    await page.route('**/api/stations/C1', async (route) => {
      const res = await route.fetch();
      const body = await res.json();
      body.lockouts = [
        {
          id: '00000000-0000-4000-8000-000000000001',
          machineCode: 'C1',
          state: 'locked',
          appliedAt: new Date().toISOString(),
          reason: 'Replace the clamp cylinder',
        },
      ];
      await route.fulfill({ response: res, json: body });
    });
    await page.goto('/station/C1');
    const banner = page.getByRole('alert').filter({ hasText: 'Locked out — do not operate' });
    await expect(banner).toContainText('C1 · Replace the clamp cylinder');
    const dueList = page.getByRole('region', { name: 'Due on C1' });
    if (due.length) {
      await dueList.getByRole('link', { name: new RegExp(`#${due[0].number} `) }).tap();
      await expect(page).toHaveURL(new RegExp(`/work-orders/${due[0].id}$`));
      await page.goBack();
    } else {
      await expect(dueList).toContainText('No open work orders.');
    }
    await expect(banner).toBeVisible();
    await expectAccessible(page, 'station with a lockout');
    await snap(page, 'station-lockout-tablet');
    await page.setViewportSize({ width: 390, height: 844 });
    await snap(page, 'station-lockout-phone');
    await page.screenshot({ path: 'tests/e2e/artifacts/station-lockout-phone-top.png' });
    await page.getByRole('button', { name: 'Record counters' }).scrollIntoViewIfNeeded();
    await page.screenshot({ path: 'tests/e2e/artifacts/station-lockout-phone-counters.png' });
  });

  test('the QR label opens the station page', async ({ page }) => {
    await signIn(page, 'operator@alder-row.example');
    await page.goto('/station/C2');
    await expect(page.getByRole('heading', { name: 'Due on C2' })).toBeVisible();
    await page.getByRole('link', { name: 'Print QR label' }).tap();
    const qr = page.getByRole('img', { name: /QR code that opens http:\/\/127\.0\.0\.1:\d+\/station\/C2/ });
    await expect(qr).toBeVisible();
    await expectAccessible(page, 'QR label');
    await snap(page, 'station-label');
  });
});

test('a counter CSV with one bad row is reported with its line and nothing is written', async ({ page }) => {
  await signIn(page, 'tech@alder-row.example');
  const latestReading = async (p: Page) => {
    const s = await (await p.request.get('/api/stations/C1')).json();
    return s.torches[0].startsMeter.latest as { value: number; readAt: string };
  };
  const latest = async (p: Page) => (await latestReading(p)).value;
  const last = await latestReading(page);
  const before = last.value;
  // Earlier tests record C1-T's counter too: the file's times fall between its latest reading and now.
  const from = Date.parse(last.readAt);
  const span = Date.now() - from;
  const iso = (part: number) => new Date(from + span * part).toISOString();
  const csv = [
    'machine_code,meter_code,read_at,value,reset',
    `C1-T,arc-starts,${iso(0.25)},${before + 40},no`,
    `C1-T,arc-starts,${iso(0.5)},${before + 80},no`,
    `C1-T,arc-starts,${iso(0.75)},not-a-number,no`,
    `C1-T,arc-hours,${iso(0.75)},99999,no`,
  ].join('\n');

  await page.getByRole('link', { name: 'Counter import' }).click();
  await expect(page.getByRole('heading', { name: 'Import counter readings' })).toBeVisible();
  await page.getByLabel('CSV file (at most 50 MB)').setInputFiles({ name: 'counters.csv', mimeType: 'text/csv', buffer: Buffer.from(csv) });
  await page.getByRole('button', { name: 'Check the file' }).click();
  const problems = page.getByRole('table', { name: 'Problems in the file' });
  await expect(page.getByRole('alert').filter({ hasText: '1 problem found — nothing can be imported yet' })).toBeVisible();
  await expect(problems.getByRole('row').nth(1)).toContainText('4');
  await expect(problems.getByRole('row').nth(1)).toContainText('“not-a-number” is not a number');
  await expect(page.getByRole('button', { name: /^Import \d+ reading/ })).toBeDisabled();
  await expectAccessible(page, 'counter import preview');
  await snap(page, 'counter-import-preview');

  // The server refuses the same file too, and writes none of its good rows.
  const { token } = await (await page.request.get('/api/auth/csrf')).json();
  const res = await page.request.post('/api/counter-import', {
    headers: { 'X-CSRF-Token': token },
    multipart: { file: { name: 'counters.csv', mimeType: 'text/csv', buffer: Buffer.from(csv) } },
  });
  expect(res.status()).toBe(400);
  expect((await res.json()).message).toMatch(/^1 problem in the file; nothing was imported/);
  expect(await latest(page)).toBe(before);
});
