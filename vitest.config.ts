import { defineConfig } from "vitest/config";
import { fileURLToPath } from "node:url";

const root = fileURLToPath(new URL(".", import.meta.url));

export default defineConfig({
  resolve: { alias: { "@": root, "server-only": `${root}tests/support/empty.ts` } },
  test: {
    projects: [
      {
        extends: true,
        test: { name: "unit", include: ["tests/unit/**/*.test.ts"], environment: "node", testTimeout: 60_000 },
      },
      {
        extends: true,
        test: {
          name: "integration",
          include: ["tests/integration/**/*.test.ts"],
          environment: "node",
          testTimeout: 60_000,
          hookTimeout: 60_000,
          fileParallelism: false,
          globalSetup: ["tests/integration/global-setup.ts"],
          setupFiles: ["tests/support/loopback-only.cjs", "tests/integration/setup-db.ts"],
          // Integration tests own a database of their own on the private server; never the app's.
          env: { DB_NAME: process.env.DB_TEST_NAME ?? "platewright_test", NODE_ENV: "test" },
        },
      },
    ],
    server: { deps: { inline: ["maxrects-packer"] } },
  },
});
