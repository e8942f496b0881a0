/** The organisation's financial year: read by pages and reports, set by the owner. */
import { eq } from "drizzle-orm";
import { recordAudit } from "~/audit/record-audit.server";
import { db } from "~/db/client.server";
import { organizations } from "~/db/schema";

/** The month (1–12) the organisation's financial year starts in. */
export async function financialYearStart(
  organizationId: string,
): Promise<number> {
  const [row] = await db
    .select({ start: organizations.financialYearStartMonth })
    .from(organizations)
    .where(eq(organizations.id, organizationId));
  return row?.start ?? 1;
}

export async function setFinancialYearStart(
  organizationId: string,
  actorUserId: string,
  startMonth: number,
): Promise<void> {
  await db.transaction(async (tx) => {
    const [before] = await tx
      .select({ start: organizations.financialYearStartMonth })
      .from(organizations)
      .where(eq(organizations.id, organizationId));
    if (before?.start === startMonth) return;
    await tx
      .update(organizations)
      .set({ financialYearStartMonth: startMonth })
      .where(eq(organizations.id, organizationId));
    await recordAudit(tx, {
      organizationId,
      actorUserId,
      action: "organization.financial_year_changed",
      subject: organizationId,
      before: { financial_year_start_month: before?.start ?? 1 },
      after: { financial_year_start_month: startMonth },
    });
  });
}
