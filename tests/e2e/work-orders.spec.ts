import { test, expect, type Page } from '@playwright/test';
import { expectAccessible, signIn, signOut, snap } from './support';

// Smallest valid PNG (1×1 pixel), as a photo of the worn part.
const PNG = Buffer.from('iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mP8z8BQDwAEhQGAhKmMIQAAAABJRU5ErkJggg==', 'base64');
const TITLE = 'Check cartridge door seals';

async function runPassNow(page: Page) {
  await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Shop admin', exact: true }).click();
  await page.getByRole('navigation', { name: 'Shop admin' }).getByRole('link', { name: 'Pass log', exact: true }).click();
  await expect(page.getByRole('heading', { name: 'Pass log' })).toBeVisible();
  // The scheduled pass may be running at the same moment; the button says so and we try again.
  for (let attempt = 0; attempt < 5; attempt++) {
    await page.getByRole('button', { name: 'Run the pass now' }).click();
    const done = page.getByText(/^Pass finished: \d+ plans checked/);
    const busy = page.getByText(/A pass is running right now/);
    await expect(done.or(busy)).toBeVisible({ timeout: 30_000 });
    if (await done.isVisible()) return;
    await page.waitForTimeout(3_000);
  }
  throw new Error('the pass never got the lock');
}

test('a plan falls due, the technician gets the mail, does the work, signs it off and the next occurrence is scheduled', async ({ page }) => {
  test.setTimeout(180_000);
  await signIn(page, 'admin@alder-row.example');
  await page.getByRole('link', { name: 'Plans', exact: true }).click();
  await expect(page.getByRole('heading', { name: 'Maintenance plans' })).toBeVisible();
  await expect(page.getByRole('link', { name: 'Renew hydraulic oil' })).toBeVisible();
  await expectAccessible(page, 'plans');
  await snap(page, 'plans');

  // Admin writes a plan: a condition reading OR a month after it was last done, whichever first.
  await page.getByRole('link', { name: 'Write a plan' }).click();
  const form = page.getByRole('form', { name: 'Maintenance plan' });
  await form.getByLabel('Machine or component').selectOption({ label: 'F1 · Fume extractor' });
  await form.getByLabel('Title').fill(TITLE);
  await form.getByLabel('Instructions').fill('Isolate the extractor, open each cartridge door, check the seal and the clamps.');
  await form.getByRole('button', { name: 'Add a checklist line' }).click();
  await form.getByLabel('Line 1').fill('Door seals intact, no dust trails');
  await form.getByRole('button', { name: 'Add a checklist line' }).click();
  await form.getByLabel('Line 2').fill('Pressure drop after restart');
  await form.getByLabel('Answer', { exact: true }).nth(1).selectOption('measure');
  await form.getByLabel('Unit', { exact: true }).fill('Pa');
  await form.getByLabel('Lowest OK').fill('0');
  await form.getByLabel('Highest OK').fill('800');
  await form.getByLabel('Kind of trigger').first().selectOption('condition');
  await form.getByLabel('Condition reading').selectOption({ label: 'Filter pressure drop (Pa)' });
  await form.getByLabel('Due when above').fill('100');
  await form.getByRole('button', { name: 'Add a trigger' }).click();
  await form.getByLabel('Every', { exact: true }).fill('1');
  await form.getByLabel('Unit (counted from when it was last done)').selectOption('month');
  await expectAccessible(page, 'plan form');
  await snap(page, 'plan-form');
  // A bad rule is explained before anything is saved.
  await form.getByLabel('Kind of trigger').nth(1).selectOption('calendar-fixed');
  await form.getByLabel('Repeat rule (RFC 5545 RRULE)').fill('FREQ=WEEKLY;BYDAY=XX');
  await expect(form.getByText('Check the rule: BYDAY value "XX" is not [+/-n]MO..SU')).toBeVisible();
  await form.getByLabel('Kind of trigger').nth(1).selectOption('calendar-floating');
  await form.getByLabel('Every', { exact: true }).fill('1');
  await form.getByLabel('Unit (counted from when it was last done)').selectOption('month');
  await form.getByRole('button', { name: 'Save plan' }).click();

  await expect(page.getByRole('heading', { name: TITLE })).toBeVisible();
  // The filter has read above 100 Pa for a long time: due at once.
  await expect(page.getByText(/^(Due now|Past due)$/).first()).toBeVisible();
  await expectAccessible(page, 'plan detail');
  await snap(page, 'plan-detail-due');

  await runPassNow(page);
  await expectAccessible(page, 'pass log');
  await snap(page, 'pass-log');
  await signOut(page);

  // The technician finds the notice in the dev inbox (own mail only) and follows it.
  await signIn(page, 'tech@alder-row.example');
  await expect(page.getByRole('heading', { name: 'My open work' })).toBeVisible();
  await page.getByRole('link', { name: 'Dev inbox' }).click();
  // The seed's own notices are there too: open the new-work mails until one names this work.
  const body = page.locator('article');
  await expect
    .poll(
      async () => {
        const mails = page.getByRole('button', { name: /New work: WO \d+|new work orders for you/ });
        for (let i = 0; i < (await mails.count()); i++) {
          await mails.nth(i).click();
          if ((await body.textContent())?.includes(TITLE)) return true;
        }
        return false;
      },
      { timeout: 30_000, intervals: [1_000, 2_000, 5_000] },
    )
    .toBe(true);
  await expect(body).toContainText('Safety: Before you work on a machine');
  await snap(page, 'tech-inbox');
  // A mail can list several work orders, each followed by its own link: take the one after this title.
  const mailText = (await body.textContent()) ?? '';
  const ownId = mailText.slice(mailText.indexOf(TITLE)).match(/\/work-orders\/([0-9a-f-]{36})/)?.[1];
  if (ownId)
    await body
      .getByRole('link', { name: new RegExp(`/work-orders/${ownId}$`) })
      .first()
      .click();
  else {
    await body.getByRole('link', { name: /\/work-orders\?assignee=me/ }).click();
    await page.getByRole('link', { name: TITLE }).first().click();
  }

  await expect(page.getByRole('heading', { name: new RegExp(`WO \\d+ · ${TITLE}`) })).toBeVisible();
  await expect(page.getByText('Safety first')).toBeVisible();
  await expect(page.getByText('2 of 2 checklist lines have no answer')).toBeVisible();
  await expect(page.getByRole('button', { name: 'Sign off the work' })).toBeDisabled();
  await expectAccessible(page, 'work order');
  await snap(page, 'work-order-open');

  await page.getByRole('button', { name: 'Start work' }).click();
  await expect(page.getByText('Under way').first()).toBeVisible();

  const checklist = page.getByRole('form', { name: 'Checklist' });
  await checklist.getByRole('radiogroup', { name: 'Answer for Door seals intact, no dust trails' }).getByText('OK', { exact: true }).click();
  await checklist.getByLabel('Measured (Pa)').fill('1250');
  await expect(checklist.getByText('Outside the limits: mark this line Not OK')).toBeVisible();
  await checklist.getByLabel('Measured (Pa)').fill('420');
  await checklist.getByRole('radiogroup', { name: 'Answer for Pressure drop after restart' }).getByText('OK', { exact: true }).click();
  await expect(checklist.getByText('Saved. Every line is answered.')).toBeVisible();

  const parts = page.getByRole('form', { name: 'Record a part used' });
  const cartridge = await parts.locator('option', { hasText: 'FX-C325 · Extractor filter cartridge' }).getAttribute('value');
  await parts.getByLabel('Part, oil or grease').selectOption(cartridge!);
  await parts.getByLabel('Quantity').fill('9999');
  await parts.getByRole('button', { name: 'Record use' }).click();
  await expect(parts.getByText(/^Only \d+ pcs of Extractor filter cartridge in stock$/)).toBeVisible();
  await parts.getByLabel('Quantity').fill('1');
  await parts.getByRole('button', { name: 'Record use' }).click();
  await expect(page.getByText('Recorded 1 pcs Extractor filter cartridge; stock updated.')).toBeVisible();
  await expect(page.getByRole('cell', { name: 'FX-C325 · Extractor filter cartridge' })).toBeVisible();

  const log = page.getByRole('form', { name: 'Time and notes' });
  await log.getByLabel('Time spent (minutes)').fill('25');
  await log.getByLabel('Notes').fill('Seal on door 3 reseated.');
  await log.getByRole('button', { name: 'Save time and notes' }).click();
  await expect(log.getByText('Saved.')).toBeVisible();

  await page.getByLabel(/Photo or PDF/).setInputFiles({ name: 'door-3.png', mimeType: 'image/png', buffer: PNG });
  await page.getByRole('button', { name: 'Attach' }).click();
  await expect(page.getByText('door-3.png attached.')).toBeVisible();

  await expect(page.getByText('Ready to sign off')).toBeVisible();
  await page.getByRole('button', { name: 'Sign off the work' }).click();
  // The sign-off panel gives way to the record of who signed off and when the plan is due next.
  await expect(page.getByText(/Imani Oduya signed this off on .*\. The plan is next due /)).toBeVisible();
  await expect(page.getByText('Sign off the work')).toHaveCount(0);
  await snap(page, 'work-order-signed-off');

  // The plan now counts from today: next due a month out, nothing open.
  await page.getByRole('link', { name: TITLE }).first().click();
  await expect(page.getByRole('heading', { name: TITLE })).toBeVisible();
  await expect(page.getByText('On track').first()).toBeVisible();
  const next = page.locator('dt', { hasText: 'Next due' }).locator('xpath=following-sibling::dd[1]');
  await expect(next).toContainText(/in (2[89]|3[01]) days|next month/);
  await expect(page.getByRole('table', { name: 'Work orders from this plan' }).getByText('Signed off')).toBeVisible();
  await snap(page, 'plan-detail-after');
});

test('work orders list filters and the tablet detail view', async ({ browser }) => {
  const context = await browser.newContext({ viewport: { width: 800, height: 1280 }, hasTouch: true });
  const page = await context.newPage();
  await signIn(page, 'tech@alder-row.example');
  await page.getByRole('link', { name: 'Work orders', exact: true }).click();
  await expect(page.getByRole('heading', { name: 'Work orders' })).toBeVisible();
  await page.getByRole('combobox', { name: 'Due', exact: true }).selectOption('overdue');
  await expect(page).toHaveURL(/due=overdue/);
  await expect(page.getByRole('table', { name: 'Work orders' }).getByText('Past due').first()).toBeVisible();
  await expectAccessible(page, 'work orders (tablet)');
  await snap(page, 'work-orders-tablet');
  await page.getByRole('table', { name: 'Work orders' }).getByRole('link').nth(1).click();
  await expect(page.getByRole('heading', { name: /^WO \d+ · / })).toBeVisible();
  await snap(page, 'work-order-tablet');
  const url = page.url();
  await context.close();

  // Phone: the menu folds away; the work order still reads top to bottom with 44 px targets.
  const phone = await browser.newContext({ viewport: { width: 390, height: 844 }, hasTouch: true, isMobile: true });
  const p2 = await phone.newPage();
  await signIn(p2, 'tech@alder-row.example');
  await p2.goto(url);
  await expect(p2.getByRole('heading', { name: /^WO \d+ · / })).toBeVisible();
  const ok = p2.getByRole('radiogroup').first().getByText('OK', { exact: true });
  expect((await ok.boundingBox())!.height).toBeGreaterThanOrEqual(44);
  await expectAccessible(p2, 'work order (phone)');
  await snap(p2, 'work-order-phone');
  await p2.getByRole('button', { name: 'Menu' }).click();
  await expect(p2.getByRole('link', { name: 'Plans', exact: true })).toBeVisible();
  await phone.close();
});

test('calling off needs a reason, and a failed check leads to follow-up work on the same machine', async ({ page }) => {
  await signIn(page, 'tech@alder-row.example');
  await page.goto('/work-orders?q=press%20brake%20guarding');
  await page.getByRole('table', { name: 'Work orders' }).getByRole('link', { name: 'Function-test press brake guarding' }).first().click();
  const heading = page.getByRole('heading', { name: /^WO \d+ · Function-test press brake guarding/ });
  await expect(heading).toBeVisible();
  const number = (await heading.textContent())!.match(/^WO (\d+)/)![1];

  // No reason: nothing is sent, the dialog says what to write, and the work stays as it was.
  await page.getByRole('button', { name: 'Call off' }).click();
  const dialog = page.getByRole('dialog', { name: `Call off WO ${number}?` });
  await dialog.getByRole('button', { name: 'Call off' }).click();
  await expect(dialog.getByRole('alert')).toHaveText('Say why the work is called off (a few words), then call it off.');
  await dialog.getByRole('button', { name: 'Keep the work' }).click();
  await expect(dialog).toBeHidden();
  await expect(page.getByText('Waiting', { exact: true }).first()).toBeVisible();

  await page
    .getByRole('radiogroup', { name: /^Answer for Guard stops the beam/ })
    .getByText('Not OK', { exact: true })
    .click();
  await expect(page.getByText('Saved. 2 lines still to answer.')).toBeVisible();
  await page.getByRole('link', { name: 'Raise follow-up work' }).click();
  const form = page.getByRole('form', { name: 'Report work' });
  await expect(form.getByLabel('Machine')).toHaveValue(/.+/);
  await expect(form.getByLabel('Machine').locator('option:checked')).toHaveText('B1 · Press brake');
  await expect(form.getByLabel('Details')).toHaveValue(`Follow-up to WO ${number}: `);
  await form.getByLabel('What is wrong or needed').fill('Light curtain misses the test piece at the left end');
  await form.getByRole('button', { name: 'Raise work order' }).click();
  await expect(page.getByRole('heading', { name: /^WO \d+ · Light curtain misses the test piece/ })).toBeVisible();
  await expect(page.getByText('B1 Press brake')).toBeVisible();
});

test('oil analysis, my notices and the starter plans', async ({ page }) => {
  await signIn(page, 'admin@alder-row.example');
  await page.getByRole('link', { name: 'Oil analysis', exact: true }).click();
  await expect(page.getByRole('heading', { name: 'Oil analysis' })).toBeVisible();
  await expect(page.getByText('ISO 4406 scale numbers (lower is cleaner)')).toBeVisible();
  await expectAccessible(page, 'oil analysis');
  await snap(page, 'oil-analysis');

  await page.getByRole('link', { name: 'My notices', exact: true }).click();
  await page.getByRole('radio', { name: 'One summary each morning' }).check();
  await page.getByRole('button', { name: 'Save', exact: true }).click();
  await expect(page.getByText('Saved.')).toBeVisible();
  await page.getByRole('button', { name: 'Turn on my calendar feed' }).click();
  const url = await page.getByLabel('Calendar address').inputValue();
  expect(url).toMatch(/\/api\/calendar\/[A-Za-z0-9_-]+\.ics$/);
  const ics = await page.request.get(url);
  expect(ics.status()).toBe(200);
  expect(await ics.text()).toContain('BEGIN:VCALENDAR');
  await expectAccessible(page, 'my notices');
  await snap(page, 'my-notices');

  await page.getByRole('link', { name: 'Plans', exact: true }).click();
  await page.getByLabel('Machine', { exact: true }).last().selectOption({ label: 'B1 · Press brake (Press brake)' });
  const starters = page.getByRole('group', { name: 'Starter plans for B1' });
  await expect(starters.getByText('Function-test press brake guarding')).toBeVisible();
  // Before anything is applied the admin sees what fits B1 and why the rest does not.
  await expect(starters.getByRole('checkbox', { name: /Function-test press brake guarding/ })).toBeDisabled();
  await expect(starters.getByText('Already applied to B1')).toBeVisible();
  await expect(starters.getByText('Without its pump-hours (h) trigger: B1 has no such meter').first()).toBeVisible();
  await snap(page, 'starters');
});
