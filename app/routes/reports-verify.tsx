import { data, Form, Link, useNavigation } from "react-router";
import { requirePermission } from "~/auth/page-access.server";
import { Button, Card, Notice, PageHeader } from "~/components/ui";
import { dateTimeUtc, formatCount } from "~/lib/format";
import {
  verifyUploadedReport,
  type VerifyOutcome,
} from "~/reports/verify-upload.server";
import type { Route } from "./+types/reports-verify";

export const meta: Route.MetaFunction = () => [
  { title: "Verify a report · Joulebook" },
];

/** Reports are a few hundred KiB; anything far larger is not one of ours. */
const MAX_UPLOAD_BYTES = 25 * 1024 * 1024;

export async function loader({ context }: Route.LoaderArgs) {
  const { organization } = requirePermission(context, "reports.verify");
  return { organizationName: organization.name };
}

type ActionResult =
  | { error: string }
  | { fileName: string; byteSize: number; outcome: VerifyOutcome };

export async function action({ request, context }: Route.ActionArgs) {
  const { organization } = requirePermission(context, "reports.verify");
  const declared = Number(request.headers.get("content-length") ?? 0);
  if (declared > MAX_UPLOAD_BYTES)
    return data<ActionResult>(
      { error: "That file is larger than 25 MB; no Joulebook report is." },
      { status: 413 },
    );
  let file: FormDataEntryValue | null;
  try {
    file = (await request.formData()).get("file");
  } catch {
    return data<ActionResult>(
      { error: "The upload could not be read. Choose the PDF and try again." },
      { status: 400 },
    );
  }
  if (!(file instanceof File) || file.size === 0)
    return data<ActionResult>(
      { error: "Choose a PDF file to check." },
      { status: 400 },
    );
  if (file.size > MAX_UPLOAD_BYTES)
    return data<ActionResult>(
      { error: "That file is larger than 25 MB; no Joulebook report is." },
      { status: 413 },
    );
  const bytes = Buffer.from(await file.arrayBuffer());
  const outcome = await verifyUploadedReport(organization.id, bytes);
  return { fileName: file.name, byteSize: file.size, outcome };
}

export default function VerifyReport({
  loaderData,
  actionData,
  params,
}: Route.ComponentProps) {
  const busy = useNavigation().state === "submitting";
  const result = actionData as ActionResult | undefined;
  return (
    <>
      <PageHeader
        title="Verify a report"
        description={`Check that a PDF is a report ${loaderData.organizationName} issued, unaltered since it was signed.`}
        actions={
          <Link
            to={`/o/${params.orgId}/reports`}
            className="inline-flex min-h-10 items-center rounded-lg px-4 font-semibold text-spruce-700 hover:bg-spruce-50"
          >
            Back to Reports
          </Link>
        }
      />
      <div className="flex flex-col gap-6">
        <Card aria-labelledby="verify-heading">
          <h2 id="verify-heading" className="text-lg">
            Upload a PDF
          </h2>
          <p className="mt-1 text-ink-muted">
            The file is checked and then discarded; nothing is stored.
          </p>
          <Form
            method="post"
            encType="multipart/form-data"
            className="mt-4 flex flex-col gap-4 sm:flex-row sm:items-end"
          >
            <div className="flex grow flex-col gap-1">
              <label htmlFor="report-file" className="font-semibold">
                Report PDF
              </label>
              <input
                id="report-file"
                type="file"
                name="file"
                accept="application/pdf,.pdf"
                required
                className="min-h-10 rounded-lg border border-line-strong bg-surface px-3 py-2 file:mr-3 file:rounded-md file:border-0 file:bg-spruce-50 file:px-3 file:py-1 file:font-semibold file:text-spruce-800"
              />
            </div>
            <Button type="submit" disabled={busy}>
              {busy ? "Checking…" : "Verify"}
            </Button>
          </Form>
        </Card>
        {result ? <VerifyResult result={result} /> : <WhatIsChecked />}
      </div>
    </>
  );
}

function WhatIsChecked() {
  return (
    <Card aria-labelledby="checks-heading">
      <h2 id="checks-heading" className="text-lg">
        What is checked
      </h2>
      <ol className="mt-2 list-decimal space-y-1 pl-5">
        <li>
          The embedded signature: the certificate chains to Joulebook's signing
          CA, and the signature over the signed bytes is intact.
        </li>
        <li>
          Coverage: the signed byte ranges span the whole file, so nothing was
          added after signing and nothing is missing.
        </li>
        <li>
          Issue: the file's SHA-256 equals that of a report this organisation
          issued.
        </li>
      </ol>
    </Card>
  );
}

function when(iso: string | null): string {
  return iso ? dateTimeUtc(iso, { seconds: true }) : "an unknown time";
}

function VerifyResult({ result }: { result: ActionResult }) {
  if ("error" in result) return <Notice tone="error">{result.error}</Notice>;
  const { outcome } = result;
  const file = `${result.fileName} (${formatCount(result.byteSize)} bytes)`;
  if (outcome.verdict === "invalid")
    return (
      <div data-testid="verify-result" data-verdict="invalid">
        <Notice tone="error" title="Not a valid Joulebook report">
          <p>{outcome.message}</p>
          <p className="mt-1 text-sm">
            File: {file} · check failed: {outcome.reason.replaceAll("_", " ")}
          </p>
        </Notice>
      </div>
    );
  if (outcome.verdict === "not_issued_here")
    return (
      <div data-testid="verify-result" data-verdict="not_issued_here">
        <Notice
          tone="caution"
          title="Signed, but not issued by this organisation"
        >
          <p>{outcome.message}</p>
          <p className="mt-1 break-all text-sm">
            File: {file} · SHA-256 {outcome.sha256}
          </p>
        </Notice>
      </div>
    );
  return (
    <div data-testid="verify-result" data-verdict="genuine">
      <Notice tone="success" title="Genuine and unaltered">
        <p>
          This is <strong>{outcome.report.title}</strong>, issued on{" "}
          {when(outcome.report.completedAt)} at the request of{" "}
          {outcome.report.authorName ?? "a former member"}
          {outcome.report.authorEmail ? ` (${outcome.report.authorEmail})` : ""}
          .
        </p>
        <p className="mt-1">
          Signed by {outcome.signerName} at {when(outcome.signedAt)}; the
          signature covers the whole file.
        </p>
        <p className="mt-1 break-all text-sm">
          File: {file} · SHA-256 {outcome.sha256}
        </p>
      </Notice>
    </div>
  );
}
