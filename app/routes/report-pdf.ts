import { idParam, notFound, requireMembership } from "~/auth/membership.server";
import { reportFile } from "~/reports/reports.server";
import type { Route } from "./+types/report-pdf";

/** The signed PDF exactly as stored: the bytes the SHA-256 was taken of. */
export async function loader({ request, params }: Route.LoaderArgs) {
  const { organization } = await requireMembership(
    request,
    params.orgId,
    "reports.download",
  );
  const reportId = idParam(params.reportId, "No such report.");
  const file = await reportFile(organization.id, reportId);
  if (!file) notFound("No such report, or it is not finished.");
  return new Response(new Uint8Array(file.pdf), {
    headers: {
      "Content-Type": "application/pdf",
      "Content-Length": String(file.pdf.length),
      "Content-Disposition": `attachment; filename="${file.fileName}"`,
      "Cache-Control": "private, no-store",
      ETag: `"${file.sha256}"`,
      "X-Content-SHA256": file.sha256,
    },
  });
}
