// Test-wide setup, run before each test file. `server-only` throws outside a React server bundle,
// so it is stubbed for vitest, which imports db/queries directly. Every test file gets its own
// data, storage and key directories (lib/env.ts would default them to the demo's ./.data); a test
// may point one elsewhere before it first reads the settings.
import { afterAll, vi } from "vitest";
import { testDirs } from "./support/dirs";

vi.mock("server-only", () => ({}));

const dirs = testDirs("rimelog-vitest-");
Object.assign(process.env, dirs.env);
afterAll(() => dirs.remove());

// A DATABASE_URL in the developer's shell (the app on a PostgreSQL server) never reaches the
// tests: they choose their database through tests/integration/fixture.ts alone.
delete process.env.DATABASE_URL;
