/** Shared by the Reports page (client), its loader and the JSON API (server). */
import { z } from "zod";
import { idSchema } from "~/lib/ids";

/** A report's life: queued, then running, then done or failed. */
export const reportStatuses = ["queued", "running", "done", "failed"] as const;
export type ReportStatus = (typeof reportStatuses)[number];

/** A report as the Reports page and `GET …/reports` list it (never the PDF bytes). */
export const reportSummarySchema = z.strictObject({
  id: idSchema(),
  title: z.string(),
  siteId: idSchema().nullable().describe("null for a report on all sites"),
  periodKind: z.string().describe("month, quarter or year"),
  periodStart: z.string().describe("First day, YYYY-MM-DD"),
  periodEnd: z.string().describe("Last day, YYYY-MM-DD"),
  status: z.enum(reportStatuses),
  progress: z.number().int().describe("Percent done"),
  progressNote: z.string(),
  error: z.string().nullable().describe("Why a failed report failed"),
  allMonthsClosed: z.boolean().nullable(),
  sha256: z
    .string()
    .nullable()
    .describe("Hex SHA-256 of the signed PDF, once done"),
  byteSize: z.number().int().nullable(),
  pageCount: z.number().int().nullable(),
  authorName: z.string().nullable(),
  createdAt: z.iso.datetime(),
  completedAt: z.iso.datetime().nullable(),
});

export type ReportSummary = z.output<typeof reportSummarySchema>;

/** True while any of the organisation's reports is still being made. */
export function anyInProgress(list: ReportSummary[]): boolean {
  return list.some((r) => r.status === "queued" || r.status === "running");
}
