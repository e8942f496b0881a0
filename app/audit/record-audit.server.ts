import type { Executor } from "~/db/client.server";
import { auditLog } from "~/db/schema";

/** Records a human change inside the caller's transaction. */
export async function recordAudit(
  tx: Executor,
  entry: {
    organizationId: string;
    actorUserId: string | null;
    action: string;
    subject: string;
    details?: Record<string, unknown>;
  },
): Promise<void> {
  await tx.insert(auditLog).values({ ...entry, details: entry.details ?? {} });
}
