import { Form } from "react-router";
import {
  monthChoices,
  type CarbonActionResult,
} from "~/carbon/carbon-page-forms";
import {
  financialYear,
  financialYearOf,
  MONTH_NAMES,
} from "~/financial-year/financial-year";
import { Button, Card, Notice, SelectField } from "~/components/ui";

/** The financial year's first month: shown to everyone, changed by an owner. */
export function FinancialYearForm({
  startMonth,
  canEdit,
  result,
}: {
  startMonth: number;
  canEdit: boolean;
  result?: CarbonActionResult;
}) {
  const example = financialYear(
    financialYearOf("2026-01", startMonth),
    startMonth,
  );
  return (
    <Card>
      <h2 className="text-title">Financial year</h2>
      <p className="mt-1">
        Starts in {MONTH_NAMES[startMonth - 1]}: {example.label} runs from{" "}
        {example.from} to {example.to}. The Ledger, reports and budgets offer
        its years and quarters.
      </p>
      {result?.message ? (
        <Notice tone="success">{result.message}</Notice>
      ) : null}
      {canEdit ? (
        <Form method="post" className="mt-3 flex flex-wrap items-end gap-3">
          <input type="hidden" name="intent" value="financial-year" />
          <SelectField
            label="First month"
            name="start_month"
            defaultValue={String(startMonth)}
            error={result?.errors.start_month}
          >
            {monthChoices.map((m) => (
              <option key={m.value} value={m.value}>
                {m.label}
              </option>
            ))}
          </SelectField>
          <Button type="submit">Save</Button>
        </Form>
      ) : null}
    </Card>
  );
}
