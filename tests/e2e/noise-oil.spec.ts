import { test, expect } from '@playwright/test';
import { mkdirSync } from 'node:fs';
import { expectAccessible, signIn, snap } from './support';

const SHOTS = process.env.SHOTS_DIR;

test('the PPE page shows both noise verdicts with their basis, and a person’s day across tasks', async ({ page }) => {
  await page.setViewportSize({ width: 1280, height: 1600 });
  await signIn(page, 'safety@alder-row.example');
  await page.goto('/safety/ppe/requirements');
  const table = page.getByRole('table', { name: 'PPE requirements by machine and task' });
  await expect(table.getByText(/over PEL|at PEL|dBA/).first()).toBeVisible();
  // Edit the plasma-and-punching task: its preview shows the action level and the PEL each on its basis.
  await table.getByRole('row').filter({ hasText: 'Plasma cutting and punching' }).first().getByRole('button', { name: 'Edit' }).click();
  const preview = page.getByRole('complementary', { name: 'What the operator will be asked' });
  await expect(preview.getByText('Basis: hearing conservation (80–130 dBA)')).toBeVisible();
  await expect(preview.getByText('Basis: PEL (90–140 dBA)')).toBeVisible();
  await expect(preview.getByText(/Impact peak 131 dB/)).toBeVisible();
  await expect(preview.getByText(/issued protector \(NRR 29\)/)).toBeVisible();
  // A person's day: hours at two tasks add their partial doses.
  const day = page.getByRole('complementary', { name: 'Daily dose of one person' });
  const inputs = page.getByLabel(/^Hours at .+ · /);
  await inputs.nth(0).fill('4');
  await inputs.nth(1).fill('4');
  await expect(day.getByText(/Partial doses add up/)).toBeVisible();
  await expect(day.getByText(/PEL basis/).first()).toBeVisible();
  await expectAccessible(page, 'PPE requirements with noise verdicts');
  await snap(page, 'ppe-noise');
  if (SHOTS) {
    mkdirSync(SHOTS, { recursive: true });
    await page.screenshot({ path: `${SHOTS}/ppe-noise.png`, fullPage: true });
  }
});

test('an oil result shows its verdict against the new-oil value, temperature shown without a verdict', async ({ page }) => {
  await page.setViewportSize({ width: 1280, height: 1400 });
  await signIn(page, 'admin@alder-row.example');
  await page.getByRole('link', { name: 'Oil analysis', exact: true }).click();
  await expect(page.getByRole('heading', { name: 'Oil analysis' })).toBeVisible();
  await expect(page.getByText(/new oil 45.8 mm²\/s/).first()).toBeVisible();
  await expect(page.getByText('at sampling; shown, not judged').first()).toBeVisible();
  await expectAccessible(page, 'oil analysis verdicts');
  await snap(page, 'oil-verdicts');
  if (SHOTS) {
    mkdirSync(SHOTS, { recursive: true });
    await page.screenshot({ path: `${SHOTS}/oil-result.png`, fullPage: true });
  }
});
