import { hash, verify } from '@node-rs/argon2';

// argon2id with OWASP's second recommended profile (19 MiB, 2 passes, 1 lane).
const OPTIONS = { algorithm: 2 as const, memoryCost: 19_456, timeCost: 2, parallelism: 1 };

export function hashPassword(password: string): Promise<string> {
  return hash(password, OPTIONS);
}

export async function verifyPassword(stored: string, password: string): Promise<boolean> {
  try {
    return await verify(stored, password);
  } catch {
    return false;
  }
}

/** A hash to verify against when the user does not exist, so timing does not reveal names. */
let dummy: Promise<string> | null = null;
export function dummyHash(): Promise<string> {
  dummy ??= hashPassword('not-a-real-password-' + 'x'.repeat(8));
  return dummy;
}

/** Password policy for new passwords; returns the problem or null. */
export function passwordProblem(password: string, username?: string): string | null {
  if (password.length < 10) return 'must be at least 10 characters';
  if (password.length > 200) return 'must be at most 200 characters';
  if (username && password.toLowerCase().includes(username.toLowerCase())) return 'must not contain the username';
  if (!/[a-zA-Z]/.test(password) || !/[^a-zA-Z]/.test(password)) return 'must mix letters with digits or symbols';
  return null;
}
