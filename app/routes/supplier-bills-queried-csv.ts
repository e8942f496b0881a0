import { requirePermission } from "~/auth/page-access.server";
import { queriedBillsCsv } from "~/supplier-bills/bills.server";
import type { Route } from "./+types/supplier-bills-queried-csv";

/** The queried bills as CSV, to send to the supplier. */
export async function loader({ context }: Route.LoaderArgs) {
  const { organization } = requirePermission(context, "bills.view");
  return new Response(await queriedBillsCsv(organization.id), {
    headers: {
      "Content-Type": "text/csv; charset=utf-8",
      "Content-Disposition": 'attachment; filename="queried-bills.csv"',
      "Cache-Control": "private, no-store",
    },
  });
}
