import { fileURLToPath } from "node:url";
import { defineConfig } from "vitest/config";

const root = fileURLToPath(new URL(".", import.meta.url));

export default defineConfig({
  // Tests run server modules directly, as the react-server condition does for the app: the marker is empty there.
  resolve: { alias: { "@": root, "server-only": `${root}node_modules/server-only/empty.js` } },
  test: {
    // One file at a time across all projects: integration and browser tests share one app and one database.
    fileParallelism: false,
    maxWorkers: 1,
    // Pages and the queue answer asynchronously; on a loaded machine a second is not enough to wait.
    expect: { poll: { timeout: 20_000, interval: 100 } },
    projects: [
      {
        extends: true,
        test: { name: "unit", include: ["tests/unit/**/*.test.ts"], environment: "node" },
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
        },
      },
      {
        extends: true,
        test: {
          name: "e2e",
          include: ["tests/e2e/**/*.test.ts"],
          environment: "node",
          testTimeout: 120_000,
          hookTimeout: 120_000,
          fileParallelism: false,
        },
      },
    ],
  },
});
