import { defineConfig, devices } from "@playwright/test";

const port = Number(process.env.E2E_PORT ?? 3100);
const baseURL = `http://127.0.0.1:${port}`;

// Debian's Chromium, never a downloaded browser. SwiftShader renders WebGL without a GPU.
const chromiumArgs = [
  "--no-sandbox",
  "--disable-gpu",
  "--disable-background-networking",
  "--disable-component-update",
  "--disable-sync",
  "--no-first-run",
  "--disable-dev-shm-usage",
  "--use-angle=swiftshader",
  "--enable-unsafe-swiftshader",
];

export default defineConfig({
  testDir: "tests/e2e",
  outputDir: "test-results",
  fullyParallel: false,
  workers: 1,
  retries: process.env.CI ? 1 : 0,
  timeout: 60_000,
  expect: { timeout: 10_000 },
  reporter: [["list"]],
  use: {
    baseURL,
    trace: "retain-on-failure",
    screenshot: "only-on-failure",
    launchOptions: { executablePath: "/usr/bin/chromium", args: chromiumArgs },
  },
  projects: [
    { name: "setup", testMatch: /auth\.setup\.ts/ },
    { name: "chromium", use: { ...devices["Desktop Chrome"], channel: undefined }, dependencies: ["setup"] },
  ],
  webServer: {
    command: `node_modules/.bin/next start -p ${port} -H 127.0.0.1`,
    url: `${baseURL}/api/health`,
    reuseExistingServer: false,
    timeout: 60_000,
    env: {
      ...(process.env as Record<string, string>),
      NEXTAUTH_URL: baseURL,
      DB_NAME: process.env.DB_NAME ?? "platewright_e2e",
      // Nothing the server does may leave 127.0.0.1: the guard throws and logs every other target.
      NODE_OPTIONS: `${process.env.NODE_OPTIONS ?? ""} --require ${process.cwd()}/tests/support/loopback-only.cjs`.trim(),
      LOOPBACK_GUARD_LOG: `${process.cwd()}/.data/loopback-guard-e2e.log`,
      MAIL_MODE: "fake",
      PAYMENTS_MODE: "fake",
      MAIL_OUTBOX_INTERVAL_MS: "1000",
    },
  },
});
