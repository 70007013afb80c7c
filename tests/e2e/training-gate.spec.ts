import { test, expect } from '@playwright/test';
import { apiJson, DEMO_PASSWORD, expectAccessible, signIn, signOut, snap } from './support';

const step = (s: string) => [s];

test('the lockout form says before signing that a person without training on the procedure will be refused', async ({ page }) => {
  // A machine and an approved procedure of its own, on which nobody is trained yet.
  await signIn(page, 'tech@alder-row.example');
  const machine = await apiJson(page.request, 'POST', '/machines', { code: 'Q9', name: 'Deburring brush', kind: 'other' });
  const procedure = await apiJson(page.request, 'POST', '/safety/procedures', {
    machineId: machine.id,
    title: 'Deburring brush energy control',
    scope: 'Brush change and belt adjustment on the deburring unit.',
    sources: [
      {
        key: 'Q9-E1',
        kind: 'electrical',
        description: 'Main supply',
        magnitude: '400 V AC',
        isolationDevice: 'Main switch',
        location: 'Left side of the cabinet',
        relieveMethod: 'Wait for the brush to stop',
        verifyMethod: 'Press start: nothing moves',
      },
    ],
    steps: {
      prepare: step('Tell the operator'),
      shutdown: step('Stop the brush'),
      isolate: step('Turn the main switch off'),
      apply: step('Lock and tag the main switch'),
      relieve: step('Wait for the brush to stop'),
      verify: step('Press start: nothing moves'),
    },
    release: ['Remove tools, refit guards, remove the lock'],
  });
  await signOut(page);
  await signIn(page, 'safety@alder-row.example');
  await apiJson(page.request, 'POST', `/safety/procedures/${procedure.id}/versions/1/approve`, { password: DEMO_PASSWORD, retrainingRequired: true });
  await signOut(page);

  await signIn(page, 'tech@alder-row.example');
  await page.goto(`/safety/lockouts/new?machineId=${machine.id}`);
  const notice = page.getByText('You are not authorized on this procedure').locator('..');
  await expect(notice).toContainText('has no authorized-employee training on Q9');
  await expect(notice).toContainText('Signing will be refused and recorded');
  await expectAccessible(page, 'lockout form for an untrained person');
  await snap(page, 'lockout-not-authorized');
});
