import { test, expect, type Page } from '@playwright/test';
import { DEMO_PASSWORD, expectAccessible, signIn, snap } from './support';

const tablet = { viewport: { width: 800, height: 1280 }, hasTouch: true, isMobile: true };
const shot = async (page: Page, name: string) => {
  await snap(page, name);
  if (process.env.SHOTS_DIR) await page.screenshot({ path: `${process.env.SHOTS_DIR}/${name}.png`, fullPage: true });
};

test.describe('pre-use check at the station', () => {
  test.use(tablet);

  // Every line ends OK, so the brake stays in service for the specs that follow.
  test('operator opens the check from the press brake station, taps each line, signs, and is back at the station', async ({ page }) => {
    await signIn(page, 'operator@alder-row.example');
    await page.goto('/station/B1');
    await page.getByRole('link', { name: 'Pre-use check · due' }).tap();
    await expect(page.getByRole('heading', { name: 'Pre-use check · B1' })).toBeVisible();
    await expect(page.getByRole('note').filter({ hasText: 'Safety first' })).toBeVisible();

    const line = (name: RegExp) => page.getByRole('group', { name });
    const curtain = line(/light curtain/);
    await expect(curtain).toContainText('Safety-critical');
    const sign = page.getByRole('button', { name: 'Sign: pre-use check done' });
    await expect(sign).toBeDisabled();

    // A Not OK on a safety-critical line warns before anything is signed; changing it to OK clears the warning.
    await curtain.getByRole('button', { name: 'Not OK' }).tap();
    await expect(page.getByText('Do not run this machine')).toBeVisible();
    await shot(page, 'pre-use-check-not-ok');
    await curtain.getByRole('button', { name: 'OK', exact: true }).tap();
    await expect(page.getByText('Do not run this machine')).toBeHidden();
    await line(/Foot pedal/)
      .getByRole('button', { name: 'OK', exact: true })
      .tap();
    await line(/die clamps/)
      .getByRole('button', { name: 'OK', exact: true })
      .tap();
    await expect(curtain.getByRole('button', { name: 'OK', exact: true })).toHaveAttribute('aria-pressed', 'true');

    // Every answer button is a comfortable target on the tablet.
    for (const b of await page.getByRole('group').getByRole('button').all()) {
      const box = (await b.boundingBox())!;
      expect(box.height).toBeGreaterThanOrEqual(44);
      expect(box.width).toBeGreaterThanOrEqual(44);
    }
    await expectAccessible(page, 'pre-use check');
    await shot(page, 'pre-use-check-answered');

    await sign.tap();
    const dialog = page.getByRole('dialog');
    await expect(dialog).toContainText('I checked each line of this machine’s pre-use check myself');
    await dialog.getByLabel('Your password').fill(DEMO_PASSWORD);
    await dialog.getByRole('button', { name: 'Sign with my password' }).tap();

    await expect(page).toHaveURL(/\/station\/B1$/);
    const notice = page.getByRole('status').filter({ hasText: 'Pre-use check signed' });
    await expect(notice).toContainText('B1: every line OK');
    await expect(page.getByRole('region', { name: 'Machine state' })).toHaveAttribute('data-state', 'in-service');
    await expect(page.getByRole('link', { name: 'Pre-use check · done today ✓' })).toBeVisible();
    await shot(page, 'pre-use-check-back-at-station');

    // Opened again, the check says today's is done and lists it.
    await page.getByRole('link', { name: 'Pre-use check' }).tap();
    await expect(page.getByText('Checked today')).toBeVisible();
    await expect(page.getByText('All OK').first()).toBeVisible();
  });
});

test.describe('pre-use check reading and the safety officer’s summary', () => {
  test.use(tablet);

  // Nothing is signed here: the extractor stays as the demo left it.
  test('the extractor asks for the pressure drop and flags a reading over the limit before signing', async ({ page }) => {
    await signIn(page, 'operator@alder-row.example');
    await page.goto('/station/F1/pre-use-check');
    const reading = page.getByLabel('Reading (Pa)');
    await expect(page.getByRole('group', { name: /Spark arrestor/ })).toContainText('Safety-critical');
    await reading.fill('1800');
    // The demo extractor's filter meter allows up to 1500 Pa.
    await expect(page.getByText('Above the 1500 Pa limit: this line fails')).toBeVisible();
    await expect(reading).toHaveAttribute('aria-invalid', 'true');
    await page
      .getByRole('group', { name: /Spark arrestor/ })
      .getByRole('button', { name: 'OK', exact: true })
      .tap();
    await page
      .getByRole('group', { name: /pressure drop/ })
      .getByRole('button', { name: 'OK', exact: true })
      .tap();
    await expect(page.getByText('A line is not OK')).toBeVisible();
    await expect(page.getByRole('button', { name: 'Sign: pre-use check done' })).toBeEnabled();
    await shot(page, 'pre-use-check-extractor-reading');
  });

  test('the compliance summary lists today’s pre-use checks per machine', async ({ page }) => {
    await signIn(page, 'safety@alder-row.example');
    await page.goto('/safety/audit');
    const table = page.getByRole('table', { name: /Compliance by machine/ });
    await expect(table.getByRole('columnheader', { name: /Pre-use today/ })).toBeVisible();
    await expect(table.getByRole('row', { name: /B1 · Press brake/ })).toContainText('Done');
    await expect(page.getByText('Pre-use checks missing today')).toBeVisible();
    await snap(page, 'pre-use-compliance');
    // The audit page is long: keep the compliance table itself for looking at.
    if (process.env.SHOTS_DIR) await table.screenshot({ path: `${process.env.SHOTS_DIR}/pre-use-compliance-table.png` });
  });
});
