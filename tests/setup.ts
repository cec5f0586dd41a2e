// Test-wide setup: `server-only` throws outside a React server bundle, so it is
// stubbed for vitest, which imports db/queries directly.
import { vi } from "vitest";

vi.mock("server-only", () => ({}));
