// Loaded before every unit and integration test file.
// `server-only` throws outside a React Server Component bundle; under Vitest the data layer is
// imported directly, so the guard is replaced by an empty module here.
import { vi } from "vitest";

vi.mock("server-only", () => ({}));
