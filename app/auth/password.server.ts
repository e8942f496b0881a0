import { hash, verify } from "@node-rs/argon2";

// argon2id with the OWASP-recommended minimum (19 MiB, 2 passes, 1 lane).
// @node-rs/argon2 defaults to argon2id; the parameters are stated anyway so a
// library default change cannot weaken stored hashes.
const ARGON2ID = 2;
const options = {
  algorithm: ARGON2ID,
  memoryCost: 19456,
  timeCost: 2,
  parallelism: 1,
} as const;

export function hashPassword(password: string): Promise<string> {
  return hash(password, options);
}

// A hash of a random password, verified against when the e-mail is unknown so
// that the answer takes as long as for a real account.
let decoyHash: Promise<string> | undefined;

export async function verifyPassword(
  passwordHash: string | null,
  password: string,
): Promise<boolean> {
  if (!passwordHash) {
    decoyHash ??= hashPassword(crypto.randomUUID());
    await verify(await decoyHash, password).catch(() => false);
    return false;
  }
  return verify(passwordHash, password).catch(() => false);
}
