/**
 * Report generation as a background job in the serving process: a request
 * stores a queued row and returns at once; one job at a time loads the data,
 * draws the PDF, signs it and stores it with its SHA-256. Progress goes to
 * the row so any page (or another server) can show it.
 *
 * Several servers may share the database: a job is claimed by an atomic
 * queued → running update, and a running job keeps a heartbeat so one whose
 * process died is queued again instead of staying "running" for ever.
 */
import { createHash } from "node:crypto";
import { and, eq, lt, or } from "drizzle-orm";
import { db } from "~/db/client.server";
import { sendEmail } from "~/email/mailer.server";
import { reportReadyEmail } from "~/email/templates.server";
import { appUrl } from "~/env.server";
import { organizations, reports, users } from "~/db/schema";
import { financialYearStart } from "~/financial-year/financial-year.server";
import {
  anchorFor,
  periodKinds,
  reportPeriod,
  type ReportPeriod,
} from "./periods";
import { loadReportData } from "./report-data.server";
import {
  createReportDocument,
  drawReport,
  pdfBytes,
} from "./pdf/render-report.server";
import { addSignaturePlaceholder, signPdf } from "./signing/sign-pdf.server";
import { signingIdentityFromEnv } from "./signing/identity.server";
import { requestReport } from "./reports.server";

interface JobKey {
  organizationId: string;
  reportId: string;
}

const HEARTBEAT_MS = 5_000;
/** A running job whose heartbeat is older than this lost its process. */
const STALE_AFTER_MS = 60_000;

const queue: JobKey[] = [];
let draining: Promise<void> | null = null;

/** Queues a report already stored as queued; returns at once. */
export function enqueueReport(job: JobKey): void {
  queue.push(job);
  draining ??= drain().finally(() => {
    draining = null;
  });
}

/** Stores a report request and queues its job once the row is committed. */
export async function queueReport(
  input: Parameters<typeof requestReport>[0],
): ReturnType<typeof requestReport> {
  const outcome = await requestReport(input);
  if (outcome.ok)
    enqueueReport({
      organizationId: input.organizationId,
      reportId: outcome.reportId,
    });
  return outcome;
}

/** Resolves when every queued report has been made (tests, shutdown). */
export async function reportJobsIdle(): Promise<void> {
  while (draining) await draining;
}

async function drain(): Promise<void> {
  for (let job = queue.shift(); job; job = queue.shift()) {
    try {
      await runReportJob(job);
    } catch (error) {
      // runReportJob records failures on the row; this only guards the loop.
      console.error("[reports] job crashed", error);
    }
  }
}

/** Claims a queued report; null when another worker has it or it is gone. */
async function claim(job: JobKey) {
  const [row] = await db
    .update(reports)
    .set({
      status: "running",
      progress: 1,
      progressNote: "Starting",
      heartbeatAt: new Date(),
    })
    .where(
      and(
        eq(reports.organizationId, job.organizationId),
        eq(reports.id, job.reportId),
        eq(reports.status, "queued"),
      ),
    )
    .returning();
  return row ?? null;
}

function progressWriter(job: JobKey) {
  let lastWrite = 0;
  let lastPercent = 1;
  return async (fraction: number, note: string) => {
    // Whole percent from 1 to 99: 0 is "queued", 100 is "stored".
    const percent = Math.min(99, Math.max(1, Math.round(fraction * 100)));
    const now = Date.now();
    if (percent === lastPercent && now - lastWrite < HEARTBEAT_MS) return;
    if (now - lastWrite < 200 && percent - lastPercent < 10) return;
    lastWrite = now;
    lastPercent = percent;
    await db
      .update(reports)
      .set({ progress: percent, progressNote: note, heartbeatAt: new Date() })
      .where(
        and(
          eq(reports.organizationId, job.organizationId),
          eq(reports.id, job.reportId),
        ),
      );
  };
}

async function authorAndOrganization(
  organizationId: string,
  userId: string | null,
) {
  const [organization] = await db
    .select({ name: organizations.name })
    .from(organizations)
    .where(eq(organizations.id, organizationId));
  const [author] = userId
    ? await db
        .select({ name: users.name, email: users.email })
        .from(users)
        .where(eq(users.id, userId))
    : [];
  return {
    organizationName: organization?.name ?? "",
    authorName: author?.name ?? "A former member",
    authorEmail: author?.email ?? null,
  };
}

/** Makes one report: data, drawing, signature, storage. */
export async function runReportJob(job: JobKey): Promise<void> {
  const row = await claim(job);
  if (!row) return;
  const progress = progressWriter(job);
  try {
    const { organizationName, authorName, authorEmail } =
      await authorAndOrganization(row.organizationId, row.createdByUserId);
    const generatedAt = new Date();
    await progress(0.02, "Reading the ledger");
    const data = await loadReportData({
      organizationId: row.organizationId,
      siteId: row.siteId,
      period: reportPeriodFromRow(
        row,
        await financialYearStart(row.organizationId),
      ),
      reportId: row.id,
      authorName,
      generatedAt,
    });
    await progress(0.2, "Drawing pages");
    const identity = await signingIdentityFromEnv();
    const doc = createReportDocument({
      title: row.title,
      subject: `Energy report for ${organizationName}`,
      author: `${authorName} via Joulebook`,
    });
    const bytesPromise = pdfBytes(doc);
    const { pageCount } = await drawReport(doc, data, (fraction, note) =>
      progress(0.2 + fraction * 0.7, note),
    );
    addSignaturePlaceholder(doc, {
      reason: `Issued by Joulebook for ${organizationName}`,
      name: identity.signerName,
      location: "Joulebook",
      contactInfo: "",
    });
    doc.end();
    await progress(0.92, "Signing");
    const signed = await signPdf(await bytesPromise, identity);
    const sha256 = await store(job, signed, pageCount, data.allMonthsClosed);
    if (authorEmail)
      await tellAuthor({
        to: authorEmail,
        title: row.title,
        pageCount,
        sha256,
        allMonthsClosed: data.allMonthsClosed,
        url: `${appUrl()}/o/${row.organizationId}/reports`,
      });
  } catch (error) {
    await markFailed(job, error);
  }
}

/**
 * A year's report takes seconds, but people leave the page: the one who asked
 * gets an e-mail once it is stored. A failed e-mail does not fail the report.
 */
async function tellAuthor(
  message: Parameters<typeof reportReadyEmail>[0],
): Promise<void> {
  await sendEmail(reportReadyEmail(message)).catch((error) =>
    console.error("[reports] could not e-mail the author", error),
  );
}

async function store(
  job: JobKey,
  pdf: Buffer,
  pageCount: number,
  allMonthsClosed: boolean,
): Promise<string> {
  const sha256 = createHash("sha256").update(pdf).digest("hex");
  await db
    .update(reports)
    .set({
      status: "done",
      progress: 100,
      progressNote: "Signed and stored",
      pdf,
      sha256,
      byteSize: pdf.length,
      pageCount,
      allMonthsClosed,
      completedAt: new Date(),
      heartbeatAt: null,
    })
    .where(
      and(
        eq(reports.organizationId, job.organizationId),
        eq(reports.id, job.reportId),
      ),
    );
  return sha256;
}

async function markFailed(job: JobKey, error: unknown): Promise<void> {
  console.error("[reports] generation failed", job, error);
  const message = error instanceof Error ? error.message : String(error);
  await db
    .update(reports)
    .set({
      status: "failed",
      progressNote: "Failed",
      error: `The report could not be made: ${message}`.slice(0, 500),
      heartbeatAt: null,
      completedAt: new Date(),
    })
    .where(
      and(
        eq(reports.organizationId, job.organizationId),
        eq(reports.id, job.reportId),
      ),
    );
}

/**
 * Picks up reports left queued by a restart, and running ones whose process
 * stopped sending heartbeats. Called when the server starts and on a timer.
 */
export async function resumeReportJobs(): Promise<number> {
  const staleBefore = new Date(Date.now() - STALE_AFTER_MS);
  const rows = await db
    .update(reports)
    .set({ status: "queued", progress: 0, progressNote: "Waiting to start" })
    .where(
      or(
        eq(reports.status, "queued"),
        and(
          eq(reports.status, "running"),
          lt(reports.heartbeatAt, staleBefore),
        ),
      ),
    )
    .returning({
      organizationId: reports.organizationId,
      reportId: reports.id,
    });
  const waiting = new Set(queue.map((j) => j.reportId));
  for (const row of rows) if (!waiting.has(row.reportId)) enqueueReport(row);
  return rows.length;
}

/** The period a stored row names, rebuilt from its kind and first day. */
export function reportPeriodFromRow(
  row: {
    periodKind: string;
    periodStart: string;
  },
  financialYearStart = 1,
): ReportPeriod {
  const kind = periodKinds.find((k) => k === row.periodKind);
  if (!kind) throw new Error(`Unknown period kind "${row.periodKind}".`);
  // A financial year starts in its own first month; a financial quarter's
  // year start is the organisation's (financialYearStart).
  const start =
    kind === "financial_year"
      ? Number(row.periodStart.slice(5, 7))
      : financialYearStart;
  const anchor = anchorFor(kind, row.periodStart.slice(0, 7), start);
  return reportPeriod(kind, anchor, start);
}
