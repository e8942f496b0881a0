import { Form } from "react-router";
import { BrowserOnly } from "~/components/browser-only";
import { FigureTable } from "~/components/figure-table";
import { Button, Card, Field, Notice, SelectField } from "~/components/ui";
import { dayUtc, dateTimeUtc, formatNumber } from "~/lib/format";
import type { TankView } from "~/tanks/tank-page.server";
import { TankStockChart } from "./tank-stock-chart";

type Errors = Record<string, string | undefined>;

const litres = (l: number) => `${formatNumber(l, 0)} l`;

function SettingsForm({ tank, errors }: { tank: TankView; errors: Errors }) {
  return (
    <Form method="post" className="flex flex-col gap-3" noValidate>
      <input type="hidden" name="intent" value="tank-settings" />
      {errors.form ? <Notice tone="error">{errors.form}</Notice> : null}
      <div className="grid gap-3 sm:grid-cols-4">
        <Field
          label="Capacity (l)"
          name="capacityL"
          inputMode="decimal"
          defaultValue={tank?.capacityL ?? ""}
          error={errors.capacityL}
        />
        <Field
          label="Density (kg/l)"
          name="densityKgL"
          inputMode="decimal"
          defaultValue={tank?.densityKgL ?? "0.845"}
          error={errors.densityKgL}
        />
        <Field
          label="Calorific value (MJ/kg)"
          name="calorificValueMjKg"
          inputMode="decimal"
          defaultValue={tank?.calorificValueMjKg ?? "45.6"}
          error={errors.calorificValueMjKg}
        />
        <SelectField
          label="CV basis"
          name="cvBasis"
          defaultValue={tank?.cvBasis ?? "gross"}
          error={errors.cvBasis}
        >
          <option value="gross">Gross</option>
          <option value="net">Net</option>
        </SelectField>
      </div>
      <p className="text-sm text-ink-muted">
        Density and calorific value count where a delivery note gives none.
      </p>
      <div>
        <Button type="submit" variant="secondary">
          {tank ? "Save tank settings" : "Make this meter a tank"}
        </Button>
      </div>
    </Form>
  );
}

function DipForm({ errors }: { errors: Errors }) {
  return (
    <Form method="post" className="flex flex-col gap-3" noValidate>
      <input type="hidden" name="intent" value="tank-dip" />
      <h3 className="font-semibold">Enter a dip</h3>
      {errors.form ? <Notice tone="error">{errors.form}</Notice> : null}
      <Field
        label="Dipped at (UTC)"
        name="dippedAt"
        type="datetime-local"
        error={errors.dippedAt}
      />
      <Field
        label="Stock (l)"
        name="stockL"
        inputMode="decimal"
        error={errors.stockL}
      />
      <Field label="Note (optional)" name="note" maxLength={200} />
      <div>
        <Button type="submit">Save dip</Button>
      </div>
    </Form>
  );
}

function DeliveryForm({ errors }: { errors: Errors }) {
  return (
    <Form method="post" className="flex flex-col gap-3" noValidate>
      <input type="hidden" name="intent" value="tank-delivery" />
      <h3 className="font-semibold">Enter a delivery</h3>
      {errors.form ? <Notice tone="error">{errors.form}</Notice> : null}
      <Field
        label="Delivered at (UTC)"
        name="deliveredAt"
        type="datetime-local"
        error={errors.deliveredAt}
      />
      <Field
        label="Litres delivered"
        name="volumeL"
        inputMode="decimal"
        error={errors.volumeL}
      />
      <div className="grid gap-3 sm:grid-cols-2">
        <Field
          label="Density (kg/l, optional)"
          name="densityKgL"
          inputMode="decimal"
          hint="From the delivery note"
          error={errors.densityKgL}
        />
        <Field
          label="CV (MJ/kg, optional)"
          name="calorificValueMjKg"
          inputMode="decimal"
          hint="From the delivery note"
          error={errors.calorificValueMjKg}
        />
      </div>
      <Field label="Note (optional)" name="note" maxLength={200} />
      <div>
        <Button type="submit">Save delivery</Button>
      </div>
    </Form>
  );
}

function PeriodRows({
  periods,
}: {
  periods: NonNullable<TankView>["periods"];
}) {
  return (
    <FigureTable
      caption="Consumption between consecutive dips, latest first"
      columns={[
        { label: "From" },
        { label: "To" },
        { label: "Opening (l)", align: "right" },
        { label: "Delivered (l)", align: "right" },
        { label: "Closing (l)", align: "right" },
        { label: "Used (l)", align: "right" },
        { label: "Energy (kWh)", align: "right" },
      ]}
    >
      {periods.map((p) => (
        <tr key={p.from} className="border-t border-line">
          <td className="px-2 py-1 whitespace-nowrap">{dayUtc(p.from)}</td>
          <td className="px-2 py-1 whitespace-nowrap">{dateTimeUtc(p.to)}</td>
          <td className="px-2 py-1 text-right">
            {formatNumber(p.openingStockL, 0)}
          </td>
          <td className="px-2 py-1 text-right">
            {formatNumber(p.deliveriesL, 0)}
          </td>
          <td className="px-2 py-1 text-right">
            {formatNumber(p.closingStockL, 0)}
          </td>
          <td className="px-2 py-1 text-right">
            {formatNumber(p.consumptionL, 0)}
          </td>
          <td className="px-2 py-1 text-right">
            {formatNumber(p.energyKwh, 0)}
          </td>
        </tr>
      ))}
    </FigureTable>
  );
}

/**
 * A liquid-fuel meter's tank: its stock over time, the consumption between
 * dips, and (for those who edit readings) the dip, delivery and settings
 * forms. Each period's energy is spread over the meter's hours between the
 * two dips, marked estimated: the total is measured, the split is not.
 */
export function TankSection({
  tank,
  canEdit,
  errorsFor,
}: {
  tank: TankView;
  canEdit: boolean;
  errorsFor: (intent: string) => Errors;
}) {
  const last = tank?.dips.at(-1);
  return (
    <Card aria-labelledby="tank-heading">
      <h2 id="tank-heading" className="text-lg">
        Tank
      </h2>
      {tank ? (
        <p className="mt-1 text-ink-muted">
          Capacity {litres(tank.capacityL)}
          {last
            ? ` · ${litres(last.stockL)} at the last dip, ${dateTimeUtc(last.at)}`
            : ""}
          {` · ${tank.deliveries.length} deliveries`}. Use between two dips is
          opening + deliveries − closing; its energy is shared evenly over the
          hours between them and marked estimated.
        </p>
      ) : (
        <p className="mt-1 text-ink-muted">
          Give this meter a capacity to enter dips and deliveries: their balance
          gives the oil used between dips.
        </p>
      )}
      {tank && tank.dips.length > 1 ? (
        <div className="mt-4 flex flex-col gap-4">
          <BrowserOnly>
            <TankStockChart
              dips={tank.dips}
              deliveries={tank.deliveries}
              capacityL={tank.capacityL}
            />
          </BrowserOnly>
          <PeriodRows periods={tank.periods} />
        </div>
      ) : null}
      {canEdit ? (
        <div className="mt-4 flex flex-col gap-6">
          {tank ? (
            <div className="grid gap-6 md:grid-cols-2">
              <DipForm errors={errorsFor("tank-dip")} />
              <DeliveryForm errors={errorsFor("tank-delivery")} />
            </div>
          ) : null}
          <details open={!tank}>
            <summary className="cursor-pointer font-semibold text-spruce-700">
              Tank settings
            </summary>
            <div className="mt-3">
              <SettingsForm tank={tank} errors={errorsFor("tank-settings")} />
            </div>
          </details>
        </div>
      ) : null}
    </Card>
  );
}
