import { expect, type APIRequestContext, type Page } from '@playwright/test';
import { createRequire } from 'node:module';
import { mkdirSync, readFileSync } from 'node:fs';

const require = createRequire(import.meta.url);
export const DEMO_PASSWORD = 'kerfbook-demo';
const axeSource = readFileSync(require.resolve('axe-core/axe.min.js'), 'utf8');
export const ARTIFACTS = 'tests/e2e/artifacts';
mkdirSync(ARTIFACTS, { recursive: true });

export async function signIn(page: Page, email: string) {
  await page.goto('/sign-in');
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password').fill(DEMO_PASSWORD);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await expect(page.getByRole('button', { name: 'Sign out' })).toBeVisible();
}

export async function signOut(page: Page) {
  await page.getByRole('button', { name: 'Sign out' }).click();
  await expect(page.getByRole('heading', { name: 'Sign in' })).toBeVisible();
}

type AxeResult = { violations: { id: string; impact: string | null; help: string; nodes: { target: string[] }[] }[] };

/** Runs axe-core in the page; fails on serious or critical violations (WCAG 2.x A/AA rules). */
export async function expectAccessible(page: Page, label: string) {
  // Evaluated through the DevTools protocol, so the app's CSP stays on while axe runs.
  await page.evaluate(axeSource);
  const result = await page.evaluate(async () => {
    const axe = (window as unknown as { axe: { run: (ctx: Document, opts: object) => Promise<AxeResult> } }).axe;
    return axe.run(document, { runOnly: { type: 'tag', values: ['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa', 'wcag22aa'] } });
  });
  const bad = result.violations.filter((v) => v.impact === 'serious' || v.impact === 'critical');
  expect(
    bad.map(
      (v) =>
        `${label}: ${v.id} (${v.impact}) ${v.help} at ${v.nodes
          .map((n) => n.target.join(' '))
          .slice(0, 3)
          .join(', ')}`,
    ),
  ).toEqual([]);
}

export async function snap(page: Page, name: string) {
  await page.screenshot({ path: `${ARTIFACTS}/${name}.png`, fullPage: true });
}

/** A JSON API call with the CSRF token, for setting up state; any answer from 300 up fails the test with the route and body. */
export async function apiJson(request: APIRequestContext, method: 'GET' | 'POST' | 'PUT', url: string, data?: unknown) {
  const { token } = await (await request.get('/api/auth/csrf')).json();
  const res = await request.fetch(`/api${url}`, { method, headers: { 'X-CSRF-Token': token }, data });
  expect(res.status(), `${method} ${url}: ${await res.text()}`).toBeLessThan(300);
  return res.json();
}

/** Signs in the open signing dialog with the demo password and waits for it to close. */
export async function signInDialog(page: Page) {
  const dialog = page.getByRole('dialog');
  await expect(dialog).toBeVisible();
  await dialog.getByLabel('Your password').fill(DEMO_PASSWORD);
  await dialog.getByRole('button', { name: 'Sign with my password' }).click();
  await expect(dialog).toBeHidden();
}
