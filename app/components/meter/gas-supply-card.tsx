/**
 * A gas meter's supply on its page: the calorific values by month (or a
 * single day), a form to enter one and a CSV upload for many, and how the
 * meter's volumes are brought to standard conditions.
 */
import { Form } from "react-router";
import { Button, Card, Field, Notice, SelectField } from "~/components/ui";
import { calendarDay, dayUtc, formatNumber, monthShort } from "~/lib/format";

export interface GasSupplyView {
  values: {
    period: string;
    periodKind: "month" | "day";
    calorificValueMjM3: number;
    basis: "gross" | "net";
    source: string;
    updatedAt: string;
  }[];
  settings: {
    registerUnit: "m3" | "hcf" | null;
    correctionFactor: number | null;
    gasTempC: number | null;
    gasPressureMbarG: number | null;
    effectiveCorrection: number;
  };
}

const periodWords = (period: string, kind: "month" | "day") =>
  kind === "month" ? monthShort(`${period}-01`) : calendarDay(period);

function correctionWords(s: GasSupplyView["settings"]): string {
  const factor = formatNumber(s.effectiveCorrection, 4, { fixed: true });
  if (s.correctionFactor !== null)
    return `Volumes × ${factor} (stated factor).`;
  if (s.gasTempC !== null && s.gasPressureMbarG !== null)
    return `Volumes × ${factor}, from gas at ${formatNumber(s.gasTempC, 1)} °C and ${formatNumber(s.gasPressureMbarG, 0)} mbar above atmospheric.`;
  return "Volumes are taken as already at 15 °C and 1013.25 mbar.";
}

export function GasSupplyCard({
  view,
  canManage,
  errors,
}: {
  view: GasSupplyView;
  canManage: boolean;
  errors: (intent: string) => Record<string, string | undefined>;
}) {
  const { values, settings } = view;
  return (
    <Card aria-labelledby="gas-supply-heading">
      <h2 id="gas-supply-heading" className="text-lg">
        Calorific values
      </h2>
      <p className="mt-1 text-ink-muted">
        The energy in each cubic metre of this supply, from the supplier’s
        bills. Readings sent without one use the value for their day: a single
        day’s value if there is one, otherwise the month’s. Changing a value
        recalculates the hours it covers.
      </p>
      <p className="mt-2 text-sm">
        {settings.registerUnit
          ? `Register in ${settings.registerUnit === "m3" ? "cubic metres" : "hundreds of cubic feet (1 hcf = 2.832 m³)"}. `
          : "Volumes arrive per interval. "}
        {correctionWords(settings)}
      </p>
      {values.length === 0 ? (
        <Notice tone="caution">
          No calorific values yet: readings without their own value are refused
          until the month’s value is entered.
        </Notice>
      ) : (
        <div className="mt-4 max-h-80 overflow-auto">
          <table className="w-full text-left text-sm">
            <thead>
              <tr className="border-b border-line-strong">
                <th className="py-2 pr-4">Period</th>
                <th className="py-2 pr-4 text-right">MJ/m³</th>
                <th className="py-2 pr-4">Basis</th>
                <th className="py-2 pr-4">Source</th>
                <th className="py-2">Entered</th>
              </tr>
            </thead>
            <tbody>
              {[...values].reverse().map((v) => (
                <tr key={v.period} className="border-b border-line">
                  <td className="py-1.5 pr-4">
                    {periodWords(v.period, v.periodKind)}
                    {v.periodKind === "day" ? " (day)" : ""}
                  </td>
                  <td className="py-1.5 pr-4 text-right tabular-nums">
                    {formatNumber(v.calorificValueMjM3, 2, { fixed: true })}
                  </td>
                  <td className="py-1.5 pr-4">{v.basis}</td>
                  <td className="py-1.5 pr-4">{v.source || "—"}</td>
                  <td className="py-1.5">{dayUtc(v.updatedAt)}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
      {canManage ? (
        <div className="mt-6 grid gap-6 md:grid-cols-2">
          <Form method="post" className="flex flex-col gap-3" noValidate>
            <h3 className="font-semibold">Enter a value</h3>
            <input type="hidden" name="intent" value="save-cv" />
            {errors("save-cv").form ? (
              <Notice tone="error">{errors("save-cv").form}</Notice>
            ) : null}
            <Field
              label="Month or day"
              name="period"
              placeholder="2026-03 or 2026-03-15"
              required
              error={errors("save-cv").period}
            />
            <Field
              label="Calorific value (MJ/m³)"
              name="cv"
              inputMode="decimal"
              hint="Between 10 and 60; natural gas is about 38 to 41."
              required
              error={errors("save-cv").cv}
            />
            <SelectField label="Basis" name="basis" defaultValue="gross">
              <option value="gross">Gross (higher)</option>
              <option value="net">Net (lower)</option>
            </SelectField>
            <Field
              label="Source (optional)"
              name="source"
              maxLength={200}
              error={errors("save-cv").source}
            />
            <div>
              <Button type="submit">Save value</Button>
            </div>
          </Form>
          <Form
            method="post"
            encType="multipart/form-data"
            className="flex flex-col gap-3"
            noValidate
          >
            <h3 className="font-semibold">Upload a CSV</h3>
            <input type="hidden" name="intent" value="upload-cv" />
            <p className="text-sm text-ink-muted">
              Columns <code>period,cv,basis</code> (and optionally{" "}
              <code>source</code>), one row per month or day. If any row is
              wrong, nothing is saved.
            </p>
            <Field
              label="CSV file"
              name="file"
              type="file"
              accept=".csv,text/csv"
              required
              error={errors("upload-cv").file}
            />
            <div>
              <Button type="submit" variant="secondary">
                Upload values
              </Button>
            </div>
          </Form>
        </div>
      ) : null}
    </Card>
  );
}
