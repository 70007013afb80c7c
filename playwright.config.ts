import { defineConfig, devices } from '@playwright/test';

const port = Number(process.env.E2E_PORT ?? 3999);

export default defineConfig({
  testDir: 'tests/e2e',
  outputDir: process.env.E2E_OUTPUT ?? 'test-results',
  fullyParallel: false,
  workers: 1,
  retries: 0,
  // Generous on a busy 2-core machine: a sign-in (argon2) or a page's first load can take
  // several seconds when another process holds the CPU; the assertions themselves are unchanged.
  timeout: 180_000,
  expect: { timeout: 20_000 },
  reporter: [['list']],
  use: {
    baseURL: `http://127.0.0.1:${port}`,
    trace: 'retain-on-failure',
    screenshot: 'only-on-failure',
    launchOptions: {
      // Debian's Chromium; Playwright never downloads a browser here. This machine has no
      // network, so the background-networking features are switched off.
      executablePath: '/usr/bin/chromium',
      args: ['--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
    },
  },
  projects: [
    { name: 'desktop', use: { ...devices['Desktop Chrome'], viewport: { width: 1366, height: 900 } } },
  ],
  webServer: {
    command: 'bash scripts/e2e-server.sh',
    url: `http://127.0.0.1:${port}/api/health`,
    // Migrating and seeding the demo shop can take minutes on a busy machine.
    timeout: 600_000,
    reuseExistingServer: false,
    stdout: 'pipe',
  },
});
