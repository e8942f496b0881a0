import { createHash, randomBytes } from "node:crypto";

/** A random single-use token for links; only its hash is stored. */
export function newToken(bytes = 32): string {
  return randomBytes(bytes).toString("base64url");
}

/** Tokens and API keys carry 256 random bits, so a fast hash is enough. */
export function hashToken(token: string): string {
  return createHash("sha256").update(token).digest("hex");
}
