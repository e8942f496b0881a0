import { and, desc, eq } from "drizzle-orm";
import { recordAudit } from "~/audit/record-audit.server";
import { db } from "~/db/client.server";
import { organizations, reports, sites, users } from "~/db/schema";
import type { ReportPeriod } from "./periods";
import type { ReportSummary } from "./report-summary";

export type { ReportSummary };

const summaryColumns = {
  id: reports.id,
  title: reports.title,
  siteId: reports.siteId,
  periodKind: reports.periodKind,
  periodStart: reports.periodStart,
  periodEnd: reports.periodEnd,
  status: reports.status,
  progress: reports.progress,
  progressNote: reports.progressNote,
  error: reports.error,
  allMonthsClosed: reports.allMonthsClosed,
  sha256: reports.sha256,
  byteSize: reports.byteSize,
  pageCount: reports.pageCount,
  authorName: users.name,
  createdAt: reports.createdAt,
  completedAt: reports.completedAt,
};

export async function listReports(
  organizationId: string,
  limit = 100,
): Promise<ReportSummary[]> {
  const rows = await db
    .select(summaryColumns)
    .from(reports)
    .leftJoin(users, eq(users.id, reports.createdByUserId))
    .where(eq(reports.organizationId, organizationId))
    .orderBy(desc(reports.createdAt))
    .limit(limit);
  return rows.map((row) => ({
    ...row,
    // The column is text; the job only ever writes these four.
    status: row.status as ReportSummary["status"],
    createdAt: row.createdAt.toISOString(),
    completedAt: row.completedAt?.toISOString() ?? null,
  }));
}

type RequestOutcome =
  { ok: true; reportId: string } | { ok: false; field: string; reason: string };

/**
 * Records a report request (queued) and its audit entry in one transaction;
 * queueReport (report-jobs.server.ts) hands the id to the job after commit.
 */
export async function requestReport(input: {
  organizationId: string;
  // The person who acts, or null with the API token that does (actorTokenId).
  actorUserId: string | null;
  actorTokenId?: string | null;
  siteId: string | null;
  period: ReportPeriod;
}): Promise<RequestOutcome> {
  const [organization] = await db
    .select({ name: organizations.name })
    .from(organizations)
    .where(eq(organizations.id, input.organizationId));
  let scopeName = organization?.name ?? "Organisation";
  if (input.siteId) {
    const [site] = await db
      .select({ name: sites.name })
      .from(sites)
      .where(
        and(
          eq(sites.organizationId, input.organizationId),
          eq(sites.id, input.siteId),
        ),
      );
    if (!site) return { ok: false, field: "scope", reason: "No such site." };
    scopeName = site.name;
  }
  const title = `${scopeName} · ${input.period.label}`;
  const reportId = await db.transaction(async (tx) => {
    const [row] = await tx
      .insert(reports)
      .values({
        organizationId: input.organizationId,
        siteId: input.siteId,
        periodKind: input.period.kind,
        periodStart: input.period.start,
        periodEnd: input.period.end,
        title,
        createdByUserId: input.actorUserId,
        progressNote: "Waiting to start",
      })
      .returning({ id: reports.id });
    await recordAudit(tx, {
      organizationId: input.organizationId,
      actorUserId: input.actorUserId,
      actorTokenId: input.actorTokenId,
      action: "report.requested",
      subject: row.id,
      siteId: input.siteId,
      after: { title, period: input.period.label },
    });
    return row.id;
  });
  return { ok: true, reportId };
}

/** The stored PDF of a finished report, for download. */
export async function reportFile(
  organizationId: string,
  reportId: string,
): Promise<{ pdf: Buffer; sha256: string; fileName: string } | null> {
  const [row] = await db
    .select({
      pdf: reports.pdf,
      sha256: reports.sha256,
      title: reports.title,
      periodStart: reports.periodStart,
      periodKind: reports.periodKind,
    })
    .from(reports)
    .where(
      and(
        eq(reports.organizationId, organizationId),
        eq(reports.id, reportId),
        eq(reports.status, "done"),
      ),
    );
  if (!row?.pdf || !row.sha256) return null;
  return { pdf: row.pdf, sha256: row.sha256, fileName: fileNameFor(row) };
}

/** A file name that sorts by period and says what it is, ASCII only. */
export function fileNameFor(row: {
  title: string;
  periodKind: string;
  periodStart: string;
}): string {
  const scope = row.title
    .split("·")[0]
    .normalize("NFKD")
    .replace(/[^\w\s-]/g, "")
    .trim()
    .replace(/\s+/g, "-")
    .toLowerCase();
  return `joulebook-${scope || "report"}-${row.periodKind}-${row.periodStart}.pdf`;
}

/** Which of this organisation's reports has these exact bytes, if any. */
export async function findIssuedReport(
  organizationId: string,
  sha256: string,
): Promise<{
  id: string;
  title: string;
  completedAt: string | null;
  authorName: string | null;
  authorEmail: string | null;
} | null> {
  const [row] = await db
    .select({
      id: reports.id,
      title: reports.title,
      completedAt: reports.completedAt,
      authorName: users.name,
      authorEmail: users.email,
    })
    .from(reports)
    .leftJoin(users, eq(users.id, reports.createdByUserId))
    .where(
      and(
        eq(reports.organizationId, organizationId),
        eq(reports.sha256, sha256),
        eq(reports.status, "done"),
      ),
    );
  if (!row) return null;
  return { ...row, completedAt: row.completedAt?.toISOString() ?? null };
}
