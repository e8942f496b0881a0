/**
 * Invoice events can arrive out of order (a late invoice.finalized after
 * invoice.paid). An invoice only moves forward: draft → open → uncollectible
 * → paid or void, so a snapshot in an earlier state than the stored one is
 * stale and is not applied. (A written-off invoice can still be paid or
 * voided; a paid one stays paid.)
 */
const RANK: Record<string, number> = {
  draft: 0,
  open: 1,
  uncollectible: 2,
  paid: 3,
  void: 3,
};

/** Whether an incoming invoice snapshot should replace the stored one. */
export function supersedes(stored: string | null, incoming: string): boolean {
  if (stored === null) return true;
  return (RANK[incoming] ?? 0) >= (RANK[stored] ?? 0);
}
