import { Form } from "react-router";
import { Button, Card, Field } from "~/components/ui";

export interface ToleranceValues {
  percent: string | null;
  absoluteKwh: string | null;
  absoluteAmount: string | null;
}

/** How far a bill may differ before it is queried: the larger of the percentage and the absolute figure. */
export function ToleranceForm({
  tolerance,
  canManage,
  errors,
}: {
  tolerance: ToleranceValues;
  canManage: boolean;
  errors: Record<string, string>;
}) {
  return (
    <Card aria-label="Tolerance">
      <h2 className="text-title">Tolerance</h2>
      <p className="mt-1 text-sm text-ink-muted">
        A bill is queried when its kWh or its amount differs from the meters or
        the tariff&apos;s cost by more than the larger of the percentage and the
        absolute figure. Empty: not used.
      </p>
      <Form method="post" className="mt-3 flex flex-wrap items-end gap-3">
        <input type="hidden" name="intent" value="tolerance" />
        <fieldset disabled={!canManage} className="contents">
          <Field
            label="Percent"
            name="percent"
            defaultValue={tolerance.percent ?? ""}
            error={errors.percent}
            inputMode="decimal"
          />
          <Field
            label="Absolute kWh"
            name="absolute_kwh"
            defaultValue={tolerance.absoluteKwh ?? ""}
            error={errors.absolute_kwh}
            inputMode="decimal"
          />
          <Field
            label="Absolute amount"
            name="absolute_amount"
            defaultValue={tolerance.absoluteAmount ?? ""}
            error={errors.absolute_amount}
            inputMode="decimal"
          />
          {canManage ? (
            <Button type="submit" variant="secondary">
              Save tolerance
            </Button>
          ) : null}
        </fieldset>
      </Form>
    </Card>
  );
}
