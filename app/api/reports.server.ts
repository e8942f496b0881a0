/**
 * Reports over the JSON API, for auditors' and managers' own tools: list,
 * request (answered 202 while the job runs), download the signed PDF, and
 * verify a PDF sent as the request body.
 */
import type { NextFunction, Request, Response } from "express";
import { financialYearStart } from "~/financial-year/financial-year.server";
import { isUuid } from "~/lib/ids";
import { queueReport } from "~/reports/report-jobs.server";
import {
  reportRequestSchema,
  resolveReportRequest,
} from "~/reports/report-request";
import { listReports, reportFile } from "~/reports/reports.server";
import { verifyUploadedReport } from "~/reports/verify-upload.server";
import { auditActorOf } from "./principal.server";
import { sendError, sendValidationError } from "./respond.server";
import type { z } from "zod";
import type { reportListSchema, reportQueuedSchema } from "./schemas";

/** Reports are a few hundred KiB; no genuine one comes near this. */
export const VERIFY_BODY_LIMIT = "25mb";

type Handler = (req: Request, res: Response) => Promise<void>;

/** Express 5 forwards rejections itself; this keeps handlers flat. */
const handle =
  (fn: Handler) => (req: Request, res: Response, next: NextFunction) =>
    fn(req, res).catch(next);

const member = (res: Response) => res.locals.member!;

/** GET /orgs/:orgId/reports: newest first, without the PDF bytes. */
export const getReports = handle(async (_req, res) => {
  const list: z.output<typeof reportListSchema> = {
    reports: await listReports(member(res).organizationId),
  };
  res.json(list);
});

/** POST /orgs/:orgId/reports {scope, period}: 202 with the queued report's id. */
export const postReport = handle(async (req, res) => {
  const parsed = reportRequestSchema.safeParse(req.body);
  if (!parsed.success) return sendValidationError(res, parsed.error);
  const { organizationId } = member(res);
  const resolved = resolveReportRequest(
    parsed.data,
    await financialYearStart(organizationId),
  );
  if (!resolved.ok)
    return sendError(res, 400, "invalid_period", resolved.reason);
  const outcome = await queueReport({
    organizationId,
    ...auditActorOf(member(res)),
    siteId: resolved.siteId,
    period: resolved.period,
  });
  if (!outcome.ok) return sendError(res, 400, "invalid_scope", outcome.reason);
  const queued: z.output<typeof reportQueuedSchema> = {
    id: outcome.reportId,
    status: "queued",
  };
  res.status(202).json(queued);
});

/** GET /orgs/:orgId/reports/:reportId/pdf: the stored signed bytes. */
export const getReportPdf = handle(async (req, res) => {
  const reportId = String(req.params.reportId);
  const file = isUuid(reportId)
    ? await reportFile(member(res).organizationId, reportId)
    : null;
  if (!file)
    return sendError(
      res,
      404,
      "not_found",
      "No such report, or it is not finished.",
    );
  res
    .set({
      "Content-Type": "application/pdf",
      "Content-Disposition": `attachment; filename="${file.fileName}"`,
      "Cache-Control": "private, no-store",
      ETag: `"${file.sha256}"`,
      "X-Content-SHA256": file.sha256,
    })
    .send(file.pdf);
});

/** POST /orgs/:orgId/reports/verify with an application/pdf body. */
export const postVerify = handle(async (req, res) => {
  if (!Buffer.isBuffer(req.body) || req.body.length === 0)
    return sendError(
      res,
      400,
      "empty_body",
      "Send the PDF as the request body with Content-Type: application/pdf.",
    );
  res.json(await verifyUploadedReport(member(res).organizationId, req.body));
});
