// House rule: an unexpected console.error fails the test that caused it.
import { afterEach, beforeEach, vi } from "vitest";

let errors: unknown[][] = [];

beforeEach(() => {
  errors = [];
  vi.spyOn(console, "error").mockImplementation((...args: unknown[]) => {
    errors.push(args);
  });
});

afterEach(() => {
  vi.mocked(console.error).mockRestore();
  if (errors.length > 0) {
    const first = errors[0].map(String).join(" ");
    throw new Error(`Unexpected console.error (${errors.length}x): ${first}`);
  }
});
