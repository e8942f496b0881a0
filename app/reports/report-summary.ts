/** Shared by the Reports page (client) and its loader (server). */

/** A report as the Reports page lists it (never the PDF bytes). */
export interface ReportSummary {
  id: string;
  title: string;
  siteId: string | null;
  periodKind: string;
  periodStart: string;
  periodEnd: string;
  status: "queued" | "running" | "done" | "failed";
  progress: number;
  progressNote: string;
  error: string | null;
  allMonthsClosed: boolean | null;
  sha256: string | null;
  byteSize: number | null;
  pageCount: number | null;
  authorName: string | null;
  createdAt: string;
  completedAt: string | null;
}

/** True while any of the organisation's reports is still being made. */
export function anyInProgress(list: ReportSummary[]): boolean {
  return list.some((r) => r.status === "queued" || r.status === "running");
}
