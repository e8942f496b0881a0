import { newToken } from "./tokens.server";

/** Gateway keys read `jbgw_` + 43 random characters; the prefix aids support. */
export function newGatewayKey(): string {
  return `jbgw_${newToken(32)}`;
}

export function gatewayKeyPrefix(key: string): string {
  return key.slice(0, 12);
}

export function bearerToken(authorization: string | undefined): string | null {
  const match = /^Bearer\s+(\S+)$/i.exec(authorization ?? "");
  return match ? match[1] : null;
}
