import { isUuid } from "./ids";

/**
 * Revoking a key or token takes two steps: the list links to `?revoke=<id>`,
 * and the page then asks to confirm. The id being confirmed, when the URL
 * names one of `items` that is still active; else null.
 */
export function revokeBeingConfirmed(
  request: Request,
  items: readonly { id: string; revokedAt: unknown }[],
): string | null {
  const revoke = new URL(request.url).searchParams.get("revoke");
  if (!isUuid(revoke)) return null;
  return items.find((i) => i.id === revoke && !i.revokedAt)?.id ?? null;
}
