// The test harness itself (tests/support): the shared people are the accounts the demo lab seeds,
// and no test server or test process runs without its own data, storage and key directories
// (lib/env.ts defaults them to the demo's ./.data).
import { describe, expect, it } from "vitest";
import { DEMO_USERS } from "@/db/seed";
import { assertIsolatedEnv, DIR_VARS, isolationProblems, testDirs } from "../support/dirs";
import { serverEnv } from "../support/server";
import { PEOPLE } from "../support/users";

describe("test users", () => {
  it("are the demo lab's seeded accounts: ids, emails, names and roles", () => {
    expect(Object.values(PEOPLE)).toEqual(DEMO_USERS);
  });
});

describe("test directories", () => {
  it("a test server's environment names its own three directories, whatever the caller's says", () => {
    const dirs = testDirs();
    const saved = Object.fromEntries(DIR_VARS.map((k) => [k, process.env[k]]));
    try {
      // A developer's shell pointing at the demo's data must not leak into the test server.
      for (const k of DIR_VARS) process.env[k] = `./.data/${k}`;
      const env = serverEnv(dirs, { baseURL: "http://localhost:1" });
      expect({
        data: env.RIMELOG_DATA_DIR,
        storage: env.RIMELOG_STORAGE_DIR,
        keys: env.RIMELOG_KEY_DIR,
      }).toEqual({ data: dirs.dataDir, storage: dirs.storageDir, keys: dirs.keyDir });
      expect(isolationProblems(env)).toEqual([]);
      expect(() => assertIsolatedEnv(env)).not.toThrow();
    } finally {
      Object.assign(process.env, saved);
      dirs.remove();
    }
  });

  it("refuses an environment that lacks any of the three, or points one into the repository", () => {
    const dirs = testDirs();
    dirs.remove();
    for (const missing of DIR_VARS) {
      const env: Record<string, string | undefined> = { ...dirs.env, [missing]: undefined };
      expect(() => assertIsolatedEnv(env), missing).toThrow(`${missing} is not set`);
      expect(() => assertIsolatedEnv({ ...dirs.env, [missing]: "" }), missing).toThrow(`${missing} is not set`);
      expect(() => assertIsolatedEnv({ ...dirs.env, [missing]: `./.data/${missing}` }), missing).toThrow(
        `${missing}=./.data/${missing} is inside the repository`,
      );
    }
  });

  it("this test process writes into its own directories too (tests/setup.ts)", () => {
    expect(isolationProblems(process.env)).toEqual([]);
  });
});
