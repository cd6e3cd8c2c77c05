import { afterEach, vi } from "vitest";

// An unexpected console.error in a test is a bug; a test that expects one spies on it.
let errors: unknown[][] = [];
const original = console.error;
console.error = (...args: unknown[]) => {
  errors.push(args);
  original(...args);
};

afterEach(() => {
  const seen = errors;
  errors = [];
  if (seen.length > 0 && !vi.isMockFunction(console.error)) {
    throw new Error(`console.error was called during the test: ${String(seen[0]?.[0])}`);
  }
});
