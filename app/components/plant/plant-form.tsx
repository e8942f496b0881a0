import { useState } from "react";
import { Form } from "react-router";
import { LabelledOptions } from "~/components/options";
import { SectionCard } from "~/components/section-card";
import { Button, Field, Notice, SelectField } from "~/components/ui";
import {
  needsChilledTemperatures,
  needsHeatTemperatures,
  plantKindLabels,
  plantKinds,
  plantMeterRoleLabels,
  rolesOf,
  roleCarrierError,
  type PlantKind,
} from "~/plant/plant-roles";
import { roleField } from "~/plant/plant-schema";
import type { Carrier } from "~/sites/meter-kinds";

interface MeterChoice {
  id: string;
  code: string;
  name: string;
  carrier: Carrier;
}

/** Adding a plant: its kind decides which meters and temperatures it asks for. */
export function PlantForm({
  meters,
  errors,
  message,
}: {
  meters: MeterChoice[];
  errors: Record<string, string | undefined>;
  message?: string;
}) {
  const [kind, setKind] = useState<PlantKind>("boiler");
  return (
    <SectionCard headingId="add-plant-heading" title="Add plant">
      <Form method="post" className="mt-3 flex flex-col gap-4" noValidate>
        {message ? <Notice tone="success">{message}</Notice> : null}
        {errors.form ? <Notice tone="error">{errors.form}</Notice> : null}
        <input type="hidden" name="intent" value="add-plant" />
        <div className="grid gap-4 sm:grid-cols-2">
          <Field label="Name" name="name" required error={errors.name} />
          <SelectField
            label="Kind"
            name="kind"
            value={kind}
            onChange={(e) => setKind(e.target.value as PlantKind)}
            error={errors.kind}
          >
            <LabelledOptions values={plantKinds} labels={plantKindLabels} />
          </SelectField>
          {rolesOf[kind].map((role) => (
            <SelectField
              key={role}
              label={plantMeterRoleLabels[role]}
              name={roleField(role)}
              defaultValue=""
              error={errors[roleField(role)]}
            >
              <option value="">Choose a meter</option>
              {meters
                .filter((m) => roleCarrierError(role, m.carrier) === null)
                .map((m) => (
                  <option key={m.id} value={m.id}>
                    {m.code} · {m.name}
                  </option>
                ))}
            </SelectField>
          ))}
          {rolesOf[kind].includes("fuel_in") ? (
            <SelectField
              label="Fuel meters' CV basis"
              name="fuelCvBasis"
              defaultValue="gross"
            >
              <option value="gross">Gross (higher) calorific value</option>
              <option value="net">Net (lower) calorific value</option>
            </SelectField>
          ) : null}
          {needsHeatTemperatures(kind) ? (
            <>
              <Field
                label="Heating flow (°C)"
                name="heatFlowC"
                inputMode="decimal"
                hint="Design temperature"
                error={errors.heatFlowC}
              />
              <Field
                label="Heating return (°C)"
                name="heatReturnC"
                inputMode="decimal"
                error={errors.heatReturnC}
              />
            </>
          ) : null}
          {needsChilledTemperatures(kind) ? (
            <>
              <Field
                label="Chilled-water flow (°C)"
                name="chilledFlowC"
                inputMode="decimal"
                hint="Design temperature"
                error={errors.chilledFlowC}
              />
              <Field
                label="Chilled-water return (°C)"
                name="chilledReturnC"
                inputMode="decimal"
                error={errors.chilledReturnC}
              />
            </>
          ) : null}
        </div>
        <div>
          <Button type="submit">Add plant</Button>
        </div>
      </Form>
    </SectionCard>
  );
}
