/** The server's clock, in one place so tests can reason about time. */
export function now(): Date {
  return new Date();
}
