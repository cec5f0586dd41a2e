import { fileURLToPath } from "node:url";
import { configDefaults, defineConfig } from "vitest/config";

// RIMELOG_TEST_DB=postgres (with RIMELOG_TEST_PG_URL): the integration suite on a PostgreSQL server
// (tests/integration/fixture.ts), with the files that need a server (*.pg.test.ts) and without the
// kill test, which is about PGlite's data directory. Otherwise everything on PGlite.
const onServer = process.env.RIMELOG_TEST_DB === "postgres";

export default defineConfig({
  resolve: {
    alias: { "@": fileURLToPath(new URL("./", import.meta.url)) },
  },
  test: {
    include: onServer
      ? ["tests/integration/**/*.test.ts"]
      : ["tests/unit/**/*.test.ts", "tests/integration/**/*.test.ts"],
    exclude: [
      ...configDefaults.exclude,
      ...(onServer ? ["tests/integration/sync-kill.test.ts"] : ["tests/integration/**/*.pg.test.ts"]),
    ],
    environment: "node",
    testTimeout: 60_000,
    hookTimeout: 120_000,
    pool: "forks",
    setupFiles: ["tests/setup.ts"],
  },
});
