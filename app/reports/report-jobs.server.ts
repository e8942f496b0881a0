/**
 * Report generation as a job of the PostgreSQL queue (app/jobs): a request
 * stores a queued row and sends a job whose id is the report's; whichever
 * server process takes it loads the data, draws the PDF, signs it and stores
 * it with its SHA-256. Progress goes to the row so any page, served by any
 * process, can show it.
 *
 * The queue runs each job once across all processes. A failed try is retried
 * with back-off (the row says so); a process killed mid-job has its job
 * failed by its primary and retried by another process; a job out of tries
 * goes to the abandoned queue, which marks its report failed.
 */
import { createHash } from "node:crypto";
import { and, eq, inArray } from "drizzle-orm";
import { db } from "~/db/client.server";
import { sendEmail } from "~/email/mailer.server";
import { reportReadyEmail } from "~/email/templates.server";
import { appUrl } from "~/env.server";
import { organizations, reports, users } from "~/db/schema";
import { sendJob, type JobAttempt } from "~/jobs/queue.server";
import { REPORT_QUEUE } from "~/jobs/queues";
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

export interface ReportJobKey {
  organizationId: string;
  reportId: string;
}
type JobKey = ReportJobKey;

/** Stores a report request and sends its job once the row is committed. */
export async function queueReport(
  input: Parameters<typeof requestReport>[0],
): ReturnType<typeof requestReport> {
  const outcome = await requestReport(input);
  if (outcome.ok) {
    const key: JobKey = {
      organizationId: input.organizationId,
      reportId: outcome.reportId,
    };
    // Should the send fail, the row stays queued and the supervisor sends
    // it when the server next starts (supervisor.server.ts).
    await sendJob(REPORT_QUEUE, key, { id: outcome.reportId }).catch((error) =>
      console.error("[reports] could not queue the job", error),
    );
  }
  return outcome;
}

const whereReport = (job: JobKey) =>
  and(
    eq(reports.organizationId, job.organizationId),
    eq(reports.id, job.reportId),
  );

/**
 * Marks the report running for this try; null when it is finished or gone.
 * A retried job finds it still running from the try that failed.
 */
async function claim(job: JobKey, attempt: number) {
  const [row] = await db
    .update(reports)
    .set({
      status: "running",
      progress: 1,
      progressNote:
        attempt > 0 ? `Starting again (try ${attempt + 1})` : "Starting",
    })
    .where(
      and(whereReport(job), inArray(reports.status, ["queued", "running"])),
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
    if (percent === lastPercent) return;
    if (now - lastWrite < 200 && percent - lastPercent < 10) return;
    lastWrite = now;
    lastPercent = percent;
    await db
      .update(reports)
      .set({ progress: percent, progressNote: note })
      .where(whereReport(job));
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

/**
 * One try at one report: data, drawing, signature, storage. A failure is
 * written on the row and thrown, so the queue retries; the last try's
 * failure is final.
 */
export async function runReportJob(attempt: JobAttempt<JobKey>): Promise<void> {
  const job = attempt.data;
  const row = await claim(job, attempt.retryCount);
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
    if (attempt.retryCount < attempt.retryLimit) await markRetrying(job, error);
    else await markFailed(job, error);
    throw error;
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
    })
    .where(whereReport(job));
  return sha256;
}

function failureMessage(error: unknown): string {
  const message = error instanceof Error ? error.message : String(error);
  return `The report could not be made: ${message}`.slice(0, 500);
}

async function markRetrying(job: JobKey, error: unknown): Promise<void> {
  console.error(
    "[reports] generation failed; the queue will retry",
    job,
    error,
  );
  await db
    .update(reports)
    .set({ progressNote: "Failed; trying again shortly" })
    .where(whereReport(job));
}

async function markFailed(job: JobKey, error: unknown): Promise<void> {
  console.error("[reports] generation failed", job, error);
  await db
    .update(reports)
    .set({
      status: "failed",
      progressNote: "Failed",
      error: failureMessage(error),
      completedAt: new Date(),
    })
    .where(whereReport(job));
}

/**
 * A job out of tries without recording why (its process was killed on the
 * last try): its report is marked failed so the page stops waiting.
 */
export async function abandonReport(job: JobKey): Promise<void> {
  await db
    .update(reports)
    .set({
      status: "failed",
      progressNote: "Failed",
      error:
        "The report could not be made: the server making it stopped. Please ask for it again.",
      completedAt: new Date(),
    })
    .where(
      and(whereReport(job), inArray(reports.status, ["queued", "running"])),
    );
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
