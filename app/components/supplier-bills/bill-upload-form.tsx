import { Form } from "react-router";
import { Button, Card } from "~/components/ui";
import { billColumns } from "~/supplier-bills/bill-schema";

/** The upload of a supplier's bill file, and the tolerance the check uses. */
export function BillUploadForm() {
  return (
    <Card aria-label="Upload bills">
      <h2 className="text-title">Upload a supplier&apos;s bills</h2>
      <p className="mt-1 text-sm text-ink-muted">
        CSV or Excel (.xlsx) with a header row: {billColumns.join(", ")}{" "}
        (currency optional). A supply is a meter code or a tariff&apos;s name; a
        period runs from the first day of a month to the last day of a month. If
        any row is refused, nothing from the file is stored.
      </p>
      <Form
        method="post"
        encType="multipart/form-data"
        className="mt-3 flex flex-wrap items-end gap-3"
      >
        <input type="hidden" name="intent" value="upload" />
        <div className="flex flex-col gap-1">
          <label htmlFor="bill-file" className="font-semibold">
            Bill file (CSV or Excel .xlsx)
          </label>
          <input
            id="bill-file"
            type="file"
            name="file"
            required
            accept=".csv,.xlsx,text/csv,application/vnd.openxmlformats-officedocument.spreadsheetml.sheet"
            className="min-h-10 rounded-lg border border-line-strong bg-surface px-3 py-2"
          />
        </div>
        <Button type="submit">Check and store the bills</Button>
      </Form>
    </Card>
  );
}
