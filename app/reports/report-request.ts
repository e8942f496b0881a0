import { z } from "zod";
import { idSchema } from "~/lib/ids";
import { periodKinds, reportPeriod, type ReportPeriod } from "./periods";

/**
 * What a request for a report says, from the Reports form or the API: the
 * scope ("all" or a site id) and the period as "kind:anchor", e.g.
 * "month:2026-03", "quarter:2026-Q1", "year:2025", "financial_year:2025"
 * (the one starting in 2025), "financial_quarter:2025-Q1".
 */
export const reportRequestSchema = z.strictObject({
  scope: z.union([z.literal("all"), idSchema("Choose a site or all sites.")], {
    error: "Choose a site or all sites.",
  }),
  period: z
    .string({ error: "Choose a period." })
    .regex(
      new RegExp(`^(${periodKinds.join("|")}):[0-9Q-]+$`),
      "Choose a period: month:YYYY-MM, quarter:YYYY-Qn, year:YYYY, financial_year:YYYY or financial_quarter:YYYY-Qn.",
    ),
});

export type ReportRequest = z.infer<typeof reportRequestSchema>;

type Resolved =
  | { ok: true; siteId: string | null; period: ReportPeriod }
  | { ok: false; field: "period"; reason: string };

/** Turns a valid request into a site and a period, or says why not. */
export function resolveReportRequest(
  request: ReportRequest,
  /** The month (1–12) the organisation's financial year starts in. */
  financialYearStart = 1,
): Resolved {
  const [kind, anchor] = request.period.split(":") as [
    (typeof periodKinds)[number],
    string,
  ];
  try {
    return {
      ok: true,
      siteId: request.scope === "all" ? null : request.scope,
      period: reportPeriod(kind, anchor, financialYearStart),
    };
  } catch (error) {
    return { ok: false, field: "period", reason: (error as Error).message };
  }
}
