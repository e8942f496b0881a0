import { Form } from "react-router";
import { Button, Card, Field, Notice, SelectField } from "~/components/ui";
import { carrierLabels, type carriers } from "~/sites/meter-kinds";
import { BAND_SLOTS } from "~/tariffs/tariff-form";

type Carrier = (typeof carriers)[number];

export interface SupplyChoice {
  value: string;
  label: string;
}

export function supplyChoices(
  tariffs: readonly { id: string; name: string }[],
  untariffed: readonly { siteId: string; siteName: string; carrier: string }[],
): SupplyChoice[] {
  return [
    ...tariffs.map((t) => ({
      value: `t:${t.id}`,
      label: `${t.name}: a new version`,
    })),
    ...untariffed.map((s) => ({
      value: `n:${s.siteId}:${s.carrier}`,
      label: `${s.siteName} · ${carrierLabels[s.carrier as Carrier]}: a first tariff`,
    })),
  ];
}

/**
 * A tariff version: the supply, when it applies, up to three time bands and
 * the charges. Rates are typed as on the supplier's sheet (0.2710 per kWh).
 */
export function TariffVersionForm({
  choices,
  errors,
}: {
  choices: readonly SupplyChoice[];
  errors: Record<string, string | undefined>;
}) {
  return (
    <Card aria-labelledby="tariff-form-heading">
      <h2 id="tariff-form-heading" className="text-lg">
        Add a tariff or a new version
      </h2>
      <p className="mt-1 max-w-3xl text-ink-muted">
        A new version starts on its first day; the version before it then ends
        the day before. Every quarter hour of the week must be in exactly one
        time band. A change to a closed month is added as an adjusting entry.
      </p>
      {errors.form ? <Notice tone="error">{errors.form}</Notice> : null}
      <Form method="post" className="mt-4 flex flex-col gap-4" noValidate>
        <input type="hidden" name="intent" value="add-version" />
        <div className="grid gap-4 md:grid-cols-3">
          <SelectField label="Supply" name="supply" error={errors.supply}>
            {choices.map((c) => (
              <option key={c.value} value={c.value}>
                {c.label}
              </option>
            ))}
          </SelectField>
          <Field
            label="Name (a first tariff)"
            name="name"
            error={errors.name}
          />
          <Field
            label="Currency (a first tariff)"
            name="currency"
            defaultValue="GBP"
            error={errors.currency}
          />
          <Field
            label="Valid from"
            name="validFrom"
            type="date"
            required
            error={errors.validFrom}
          />
          <Field
            label="Valid to (optional, the last day)"
            name="validTo"
            type="date"
            error={errors.validTo}
          />
        </div>
        <fieldset className="flex flex-col gap-3">
          <legend className="font-semibold">Time bands (local time)</legend>
          {errors.bands ? <Notice tone="error">{errors.bands}</Notice> : null}
          {BAND_SLOTS.map((n) => (
            <div key={n} className="grid gap-3 md:grid-cols-[1fr_1fr_3fr]">
              <Field
                label={`Band ${n} name`}
                name={`band${n}Name`}
                defaultValue={n === 1 ? "Day" : n === 2 ? "Night" : ""}
              />
              <Field
                label="Unit rate per kWh"
                name={`band${n}Rate`}
                inputMode="decimal"
              />
              <Field
                label="Windows"
                name={`band${n}Windows`}
                hint={
                  n === 1
                    ? 'e.g. "Mon-Fri 07:00-23:00; Sat-Sun 09:00-12:00"'
                    : undefined
                }
                defaultValue={
                  n === 1
                    ? "Mon-Sun 07:00-23:00"
                    : n === 2
                      ? "Mon-Sun 23:00-07:00"
                      : ""
                }
              />
            </div>
          ))}
        </fieldset>
        <div className="grid gap-4 md:grid-cols-4">
          <Field
            label="Standing charge per day"
            name="standing"
            inputMode="decimal"
            error={errors.standing}
          />
          <Field
            label="Capacity charge per day"
            name="capacity"
            inputMode="decimal"
            error={errors.capacity}
          />
          <Field
            label="Maximum demand, per kW a month"
            name="maxDemand"
            inputMode="decimal"
            error={errors.maxDemand}
          />
          <Field
            label="VAT %"
            name="vatPercent"
            inputMode="decimal"
            defaultValue="20"
            error={errors.vatPercent}
          />
          <Field
            label="Levy name"
            name="levyName"
            defaultValue="Climate levy"
          />
          <Field
            label="Levy per kWh"
            name="levyRate"
            inputMode="decimal"
            error={errors.levyRate}
          />
          <Field
            label="Export rate per kWh"
            name="exportRate"
            inputMode="decimal"
            hint="Empty: exported energy is not credited"
            error={errors.exportRate}
          />
        </div>
        <div>
          <Button type="submit">Save the version</Button>
        </div>
      </Form>
    </Card>
  );
}
