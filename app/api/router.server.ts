import express, { Router } from "express";
import { stripeWebhook, WEBHOOK_BODY_LIMIT } from "./billing-webhook.server";
import { getAuditCsv, getAuditEntries } from "./audit.server";
import { evaluateEnergy, EVALUATE_BODY_LIMIT } from "./evaluate.server";
import { health } from "./health.server";
import { getLedger, getLedgerCsv, getLedgerXlsx } from "./ledger.server";
import { getIntervals } from "./intervals.server";
import { requireOrgMember } from "./org-member.server";
import {
  getReportPdf,
  getReports,
  postReport,
  postVerify,
  VERIFY_BODY_LIMIT,
} from "./reports.server";
import { uploadReadings } from "./upload-readings.server";
import { openApiDocument } from "./openapi.server";
import { requirePrincipal } from "./principal.server";
import {
  gatewayRateLimit,
  postReadings,
  READINGS_BODY_LIMIT,
} from "./readings.server";
import { apiErrorHandler, sendError } from "./respond.server";

/** The JSON API under /api/v1. */
export function apiRouter(): Router {
  const router = Router();
  // Stripe signs the exact bytes: this route reads the raw body, and no JSON
  // parser may run before it.
  router.post(
    "/billing/webhook",
    express.raw({ type: "application/json", limit: WEBHOOK_BODY_LIMIT }),
    stripeWebhook,
  );
  router.get("/health", health);
  router.get("/openapi.json", (_req, res) => {
    res.json(openApiDocument());
  });
  router.post(
    "/energy/evaluate",
    requirePrincipal({ allowSession: true }),
    express.json({ limit: EVALUATE_BODY_LIMIT, strict: true }),
    evaluateEnergy,
  );
  router.post(
    "/readings",
    requirePrincipal({ allowSession: false }),
    gatewayRateLimit(),
    express.json({ limit: READINGS_BODY_LIMIT, strict: true }),
    postReadings,
  );
  router.get("/orgs/:orgId/ledger", requireOrgMember("ledger.view"), getLedger);
  router.get(
    "/orgs/:orgId/ledger.csv",
    requireOrgMember("ledger.view"),
    getLedgerCsv,
  );
  router.get(
    "/orgs/:orgId/ledger.xlsx",
    requireOrgMember("ledger.view"),
    getLedgerXlsx,
  );
  router.get(
    "/orgs/:orgId/audit",
    requireOrgMember("audit.view"),
    getAuditEntries,
  );
  router.get(
    "/orgs/:orgId/audit.csv",
    requireOrgMember("audit.view"),
    getAuditCsv,
  );
  router.get(
    "/orgs/:orgId/meters/:meterId/intervals",
    requireOrgMember("readings.view"),
    getIntervals,
  );
  router.post(
    "/orgs/:orgId/readings",
    requireOrgMember("readings.edit"),
    express.json({ limit: READINGS_BODY_LIMIT, strict: true }),
    uploadReadings,
  );
  router.get(
    "/orgs/:orgId/reports",
    requireOrgMember("reports.download"),
    getReports,
  );
  router.post(
    "/orgs/:orgId/reports",
    requireOrgMember("reports.create"),
    express.json({ limit: "10kb", strict: true }),
    postReport,
  );
  // Before the :reportId routes, so "verify" is never taken for an id.
  router.post(
    "/orgs/:orgId/reports/verify",
    requireOrgMember("reports.verify"),
    express.raw({ type: "application/pdf", limit: VERIFY_BODY_LIMIT }),
    postVerify,
  );
  router.get(
    "/orgs/:orgId/reports/:reportId/pdf",
    requireOrgMember("reports.download"),
    getReportPdf,
  );
  router.use((_req, res) => {
    sendError(
      res,
      404,
      "not_found",
      "No such API route. See /api/v1/openapi.json.",
    );
  });
  router.use(apiErrorHandler);
  return router;
}
