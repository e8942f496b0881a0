import { newToken } from "./tokens.server";

/**
 * Organisation API tokens read `jbtk_` + 43 random characters (256 bits).
 * The prefix tells them from gateway keys (`jbgw_`) at a glance, in a log or
 * a secret scanner, and lets the API say which kind it was sent.
 */
export const API_TOKEN_PREFIX = "jbtk_";

export function newApiTokenSecret(): string {
  return `${API_TOKEN_PREFIX}${newToken(32)}`;
}

/** What the list shows to tell tokens apart; never enough to use one. */
export function apiTokenPrefix(secret: string): string {
  return secret.slice(0, 12);
}

export function isApiTokenSecret(secret: string): boolean {
  return secret.startsWith(API_TOKEN_PREFIX);
}
