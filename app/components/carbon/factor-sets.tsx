import { Form } from "react-router";
import type { Contract, FactorSet } from "~/carbon/factor-schema";
import {
  FACTOR_FILE_HINT,
  type CarbonActionResult,
} from "~/carbon/carbon-page-forms";
import { CarrierBadge } from "~/components/carrier-badge";
import { Button, Card, Field, Notice, SelectField } from "~/components/ui";
import { carrierLabels, carriers } from "~/sites/meter-kinds";

const dash = (v: string | null) => v ?? "—";

/** The factor sets as a table, then the forms that add to them. */
export function FactorSetsSection({
  sets,
  contracts,
  canManage,
  result,
}: {
  sets: FactorSet[];
  contracts: Contract[];
  canManage: boolean;
  result?: CarbonActionResult;
}) {
  return (
    <>
      <Card>
        <h2 className="text-title">Emission factors</h2>
        <p className="mt-1 text-ink-muted">
          kg CO₂e per kWh delivered. Fuels are scope 1, bought electricity,
          heat, steam and cooling scope 2; scope 3 (losses and well-to-tank) is
          kept beside them. The market-based factor applies to supplies without
          a contract of their own.
        </p>
        {result?.message ? (
          <Notice tone="success">{result.message}</Notice>
        ) : null}
        <div className="mt-4 overflow-x-auto">
          <table
            className="w-full text-left text-sm [&_td]:px-2 [&_td]:py-1 [&_th]:px-2"
            data-testid="factor-sets"
          >
            <thead>
              <tr>
                <th>Year</th>
                <th>Carrier</th>
                <th>Scope</th>
                <th className="text-right">Location-based</th>
                <th className="text-right">Market-based</th>
                <th className="text-right">Scope 3</th>
                <th>Source</th>
                <th>Version</th>
              </tr>
            </thead>
            <tbody>
              {sets.map((s) => (
                <tr key={s.id} className="border-t border-line">
                  <td>{s.year}</td>
                  <td>
                    <CarrierBadge carrier={s.carrier} />
                  </td>
                  <td>{s.scope}</td>
                  <td className="text-right tabular-nums">
                    {s.location_kg_per_kwh}
                  </td>
                  <td className="text-right tabular-nums">
                    {dash(s.market_kg_per_kwh)}
                  </td>
                  <td className="text-right tabular-nums">
                    {dash(s.scope3_kg_per_kwh)}
                  </td>
                  <td>{s.source}</td>
                  <td>{s.version}</td>
                </tr>
              ))}
            </tbody>
          </table>
          {sets.length === 0 ? (
            <p className="mt-2">
              No emission factors yet: the ledger shows no carbon until they are
              entered.
            </p>
          ) : null}
        </div>
        {contracts.length ? (
          <>
            <h3 className="mt-6 font-semibold">Supply contracts</h3>
            <ul className="mt-1 list-disc pl-5">
              {contracts.map((c) => (
                <li key={c.id}>
                  {c.meter_code}: {c.name}, {c.kg_per_kwh} kg CO₂e/kWh from{" "}
                  {c.valid_from}
                  {c.valid_to ? ` to ${c.valid_to}` : " on"}
                </li>
              ))}
            </ul>
          </>
        ) : null}
      </Card>
      {canManage ? <FactorForms result={result} /> : null}
    </>
  );
}

function FactorForms({ result }: { result?: CarbonActionResult }) {
  const errors = result?.intent === "save-set" ? result.errors : {};
  const upload = result?.intent === "upload-sets" ? result : undefined;
  return (
    <Card>
      <h2 className="text-title">Add or replace a factor set</h2>
      <Form method="post" className="mt-3 grid gap-4 sm:grid-cols-3">
        <input type="hidden" name="intent" value="save-set" />
        <Field
          label="Year"
          name="year"
          inputMode="numeric"
          error={errors.year}
        />
        <SelectField label="Carrier" name="carrier" error={errors.carrier}>
          {carriers.map((c) => (
            <option key={c} value={c}>
              {carrierLabels[c]}
            </option>
          ))}
        </SelectField>
        <Field
          label="Location-based (kg CO₂e/kWh)"
          name="location_kg_per_kwh"
          inputMode="decimal"
          error={errors.location_kg_per_kwh}
        />
        <Field
          label="Market-based (kg CO₂e/kWh)"
          name="market_kg_per_kwh"
          inputMode="decimal"
          hint="Residual mix; empty: the location-based factor"
          error={errors.market_kg_per_kwh}
        />
        <Field
          label="Scope 3 (kg CO₂e/kWh)"
          name="scope3_kg_per_kwh"
          inputMode="decimal"
          error={errors.scope3_kg_per_kwh}
        />
        <Field label="Version" name="version" error={errors.version} />
        <Field
          label="Source"
          name="source"
          className="sm:col-span-3"
          hint="Who published the factors; a set without a source is refused."
          error={errors.source}
        />
        {errors.form ? <Notice tone="error">{errors.form}</Notice> : null}
        <div>
          <Button type="submit">Save factor set</Button>
        </div>
      </Form>
      <h2 className="mt-8 text-title">Upload a factor file</h2>
      <Form
        method="post"
        encType="multipart/form-data"
        className="mt-3 flex flex-col gap-3"
      >
        <input type="hidden" name="intent" value="upload-sets" />
        <Field
          label="CSV file"
          name="file"
          type="file"
          accept=".csv,text/csv"
          hint={FACTOR_FILE_HINT}
          error={upload?.errors.file}
        />
        {upload?.problems?.length ? (
          <ul
            className="list-disc pl-5 text-danger-700"
            data-testid="factor-file-problems"
          >
            {upload.problems.slice(0, 50).map((p, i) => (
              <li key={i}>
                Row {p.row}: {p.message}
              </li>
            ))}
          </ul>
        ) : null}
        <div>
          <Button type="submit">Upload factors</Button>
        </div>
      </Form>
    </Card>
  );
}
