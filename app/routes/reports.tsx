import { financialYearStart } from "~/financial-year/financial-year.server";
import { useEffect } from "react";
import { data, Form, Link, useNavigation, useRevalidator } from "react-router";
import { requirePermission } from "~/auth/page-access.server";
import { can } from "~/auth/permissions";
import { Cautions } from "~/components/cautions";
import { ListCard } from "~/components/list-card";
import {
  Badge,
  Button,
  Card,
  EmptyState,
  Notice,
  PageHeader,
  SelectField,
} from "~/components/ui";
import { parseForm } from "~/lib/forms";
import { dateTimeUtc, formatKib } from "~/lib/format";
import { periodChoices } from "~/reports/period-options.server";
import {
  reportRequestSchema,
  resolveReportRequest,
} from "~/reports/report-request";
import { queueReport } from "~/reports/report-jobs.server";
import { listReports } from "~/reports/reports.server";
import { anyInProgress, type ReportSummary } from "~/reports/report-summary";
import { listSites } from "~/sites/sites.server";
import { SiteOptions } from "~/components/options";
import type { Route } from "./+types/reports";

export const meta: Route.MetaFunction = () => [
  { title: "Reports · Joulebook" },
];

export async function loader({ context }: Route.LoaderArgs) {
  const { organization, role } = requirePermission(context, "reports.download");
  const [reports, sites, periods] = await Promise.all([
    listReports(organization.id),
    listSites({ organizationId: organization.id }),
    periodChoices(organization.id),
  ]);
  return {
    organization,
    reports,
    sites: sites.map((s) => ({ id: s.id, name: s.name })),
    periods,
    canCreate: can(role, "reports.create"),
    canVerify: can(role, "reports.verify"),
  };
}

type ActionResult = { errors: Record<string, string>; queued?: string };

export async function action({ request, context }: Route.ActionArgs) {
  const { organization, user } = requirePermission(context, "reports.create");
  const form = parseForm(await request.formData(), reportRequestSchema);
  if (!form.ok)
    return data<ActionResult>({ errors: form.errors }, { status: 400 });
  const resolved = resolveReportRequest(
    form.data,
    await financialYearStart(organization.id),
  );
  if (!resolved.ok)
    return data<ActionResult>(
      { errors: { [resolved.field]: resolved.reason } },
      { status: 400 },
    );
  const outcome = await queueReport({
    organizationId: organization.id,
    actorUserId: user.id,
    siteId: resolved.siteId,
    period: resolved.period,
  });
  if (!outcome.ok)
    return data<ActionResult>(
      { errors: { [outcome.field]: outcome.reason } },
      { status: 400 },
    );
  return data<ActionResult>({ errors: {}, queued: resolved.period.label });
}

/** Re-reads the list every second while a report is being made. */
function usePollWhile(active: boolean) {
  const revalidator = useRevalidator();
  useEffect(() => {
    if (!active) return;
    const timer = setInterval(() => {
      if (revalidator.state === "idle") void revalidator.revalidate();
    }, 1000);
    return () => clearInterval(timer);
  }, [active, revalidator]);
}

export default function Reports({
  loaderData,
  actionData,
  params,
}: Route.ComponentProps) {
  const { reports, canCreate, canVerify } = loaderData;
  usePollWhile(anyInProgress(reports));
  return (
    <>
      <PageHeader
        title="Reports"
        description="Signed PDF reports of the ledger for a site or the whole organisation. Anyone can check a copy: the signature breaks if a single byte changes."
        actions={
          <div className="flex flex-wrap gap-2">
            {canVerify ? (
              <Link
                to={`/o/${params.orgId}/reports/verify`}
                className="inline-flex min-h-10 items-center rounded-lg px-4 font-semibold text-spruce-700 ring-1 ring-inset ring-line-strong hover:bg-sunken"
              >
                Verify a report
              </Link>
            ) : null}
            <a
              href="/signing-ca.pem"
              download="joulebook-signing-ca.pem"
              className="inline-flex min-h-10 items-center rounded-lg px-4 font-semibold text-spruce-700 hover:bg-spruce-50"
            >
              Signing CA certificate
            </a>
          </div>
        }
      />
      <div className="flex flex-col gap-6">
        {canCreate ? (
          <NewReportCard
            loaderData={loaderData}
            actionData={actionData as ActionResult | undefined}
          />
        ) : null}
        <ReportList reports={reports} orgId={params.orgId} />
        <Cautions />
      </div>
    </>
  );
}

function NewReportCard({
  loaderData,
  actionData,
}: {
  loaderData: Route.ComponentProps["loaderData"];
  actionData: ActionResult | undefined;
}) {
  const { sites, periods } = loaderData;
  const busy = useNavigation().state === "submitting";
  const errors = actionData?.errors ?? {};
  if (!periods.suggested)
    return (
      <Card>
        <EmptyState title="Nothing to report yet">
          Reports cover months with ledger data. Once meters have readings, the
          months appear here.
        </EmptyState>
      </Card>
    );
  return (
    <Card aria-labelledby="new-report-heading">
      <h2 id="new-report-heading" className="text-lg">
        Make a report
      </h2>
      <p className="mt-1 text-ink-muted">
        The report is drawn and signed in the background; this list shows its
        progress. Open months are marked provisional in the report.
      </p>
      {actionData?.queued ? (
        <div className="mt-3">
          <Notice tone="success">
            Report for {actionData.queued} queued. It appears below when signed.
          </Notice>
        </div>
      ) : null}
      {errors.form ? (
        <div className="mt-3">
          <Notice tone="error">{errors.form}</Notice>
        </div>
      ) : null}
      <Form
        method="post"
        className="mt-4 grid gap-4 sm:grid-cols-[1fr_1fr_auto] sm:items-end"
      >
        <SelectField
          label="Scope"
          name="scope"
          defaultValue="all"
          error={errors.scope}
        >
          <option value="all">All sites</option>
          <SiteOptions sites={sites} />
        </SelectField>
        <SelectField
          label="Period"
          name="period"
          defaultValue={periods.suggested}
          error={errors.period}
        >
          <optgroup label="Months">
            {periods.months.map((p) => (
              <option key={p.value} value={p.value}>
                {p.label}
              </option>
            ))}
          </optgroup>
          <optgroup label="Quarters">
            {periods.quarters.map((p) => (
              <option key={p.value} value={p.value}>
                {p.label}
              </option>
            ))}
          </optgroup>
          <optgroup label="Years">
            {periods.years.map((p) => (
              <option key={p.value} value={p.value}>
                {p.label}
              </option>
            ))}
          </optgroup>
          <optgroup label="Financial years and quarters">
            {periods.financial.map((p) => (
              <option key={p.value} value={p.value}>
                {p.label}
              </option>
            ))}
          </optgroup>
        </SelectField>
        <Button type="submit" disabled={busy}>
          {busy ? "Queuing…" : "Make signed report"}
        </Button>
      </Form>
    </Card>
  );
}

function ReportList({
  reports,
  orgId,
}: {
  reports: ReportSummary[];
  orgId: string;
}) {
  return (
    <ListCard
      headingId="report-list-heading"
      title="Issued reports"
      empty={
        reports.length === 0
          ? {
              title: "No reports yet",
              text: "An energy manager or owner can make one above.",
            }
          : null
      }
      list={{ className: "mt-2", "aria-live": "polite" }}
    >
      {reports.map((r) => (
        <ReportItem key={r.id} report={r} orgId={orgId} />
      ))}
    </ListCard>
  );
}

function ReportItem({
  report: r,
  orgId,
}: {
  report: ReportSummary;
  orgId: string;
}) {
  return (
    <li
      className="flex flex-wrap items-start justify-between gap-3 py-4"
      data-testid="report-item"
    >
      <div className="min-w-0">
        <p className="font-semibold">{r.title}</p>
        <p className="text-sm text-ink-muted">
          Requested by {r.authorName ?? "a former member"} on{" "}
          {dateTimeUtc(r.createdAt)}
          {r.pageCount ? ` · ${r.pageCount} pages` : ""}
          {r.byteSize ? ` · ${formatKib(r.byteSize)}` : ""}
        </p>
        {r.sha256 ? (
          <p
            className="mt-1 break-all font-mono text-xs text-ink-muted"
            title="SHA-256 of the signed file"
          >
            SHA-256 {r.sha256}
          </p>
        ) : null}
        {r.status === "failed" ? (
          <p className="mt-1 text-sm font-semibold text-danger-700">
            {r.error}
          </p>
        ) : null}
      </div>
      <div className="flex items-center gap-3">
        <StatusBadge report={r} />
        {r.status === "done" ? (
          <a
            href={`/o/${orgId}/reports/${r.id}/pdf`}
            className="inline-flex min-h-10 items-center rounded-lg bg-spruce-700 px-4 font-semibold text-white hover:bg-spruce-800"
          >
            Download PDF
          </a>
        ) : null}
      </div>
      {r.status === "queued" || r.status === "running" ? (
        <Progress report={r} />
      ) : null}
    </li>
  );
}

function StatusBadge({ report: r }: { report: ReportSummary }) {
  if (r.status === "failed") return <Badge tone="danger">Failed</Badge>;
  if (r.status !== "done") return <Badge tone="frost">In progress</Badge>;
  return r.allMonthsClosed ? (
    <Badge tone="spruce">Signed · months closed</Badge>
  ) : (
    <Badge tone="copper">Signed · provisional</Badge>
  );
}

function Progress({ report: r }: { report: ReportSummary }) {
  return (
    <div className="w-full">
      <div
        role="progressbar"
        aria-label={`Progress of ${r.title}`}
        aria-valuemin={0}
        aria-valuemax={100}
        aria-valuenow={r.progress}
        className="h-2 w-full overflow-hidden rounded-full bg-sunken"
      >
        <div
          className="h-full rounded-full bg-spruce-600 transition-[width]"
          style={{ width: `${Math.max(2, r.progress)}%` }}
        />
      </div>
      <p className="mt-1 text-sm text-ink-muted">
        {r.progress}% · {r.progressNote}
      </p>
    </div>
  );
}
