import { idParam, notFound } from "~/auth/membership.server";
import { requirePermission } from "~/auth/page-access.server";
import { reportFile } from "~/reports/reports.server";
import type { Route } from "./+types/report-pdf";

/** The signed PDF exactly as stored: the bytes the SHA-256 was taken of. */
export async function loader({ params, context }: Route.LoaderArgs) {
  const { organization } = requirePermission(context, "reports.download");
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
