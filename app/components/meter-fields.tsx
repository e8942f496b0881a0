import {
  carrierLabels,
  carriers,
  DEFAULT_INTERVAL_MINUTES,
  intervalResolutions,
  quantities,
  resolutionLabel,
  quantityLabels,
} from "~/sites/meter-kinds";
import { Field, SelectField } from "./ui";
import { LabelledOptions } from "~/components/options";

export interface MeterDefaults {
  code?: string;
  name?: string;
  quantity?: string;
  carrier?: string;
  orientation?: string;
  intervalMinutes?: number;
  parentMeterId?: string | null;
  position?: string;
  serial?: string;
  multiplier?: string;
  rolloverKwh?: string | null;
  sensorAt?: string | null;
  defaultPressureBarAbs?: string | null;
  spikeFactor?: string;
  accuracyClass?: number | null;
  deltaThetaMinK?: string | null;
  qpM3PerH?: string | null;
  installedAt?: Date | string;
}

function dateValue(value: Date | string | undefined): string {
  if (!value) return new Date().toISOString().slice(0, 10);
  return new Date(value).toISOString().slice(0, 10);
}

/** The fields of a meter, for the add and edit forms. */
export function MeterFields({
  errors,
  defaults = {},
  parents,
}: {
  errors: Record<string, string | undefined>;
  defaults?: MeterDefaults;
  parents: { id: string; code: string; name: string }[];
}) {
  return (
    <div className="grid gap-4 sm:grid-cols-2">
      <input type="hidden" name="intent" value="save-meter" />
      <Field
        label="Code"
        name="code"
        required
        hint="What gateways send as `meter`"
        defaultValue={defaults.code}
        error={errors.code}
      />
      <Field
        label="Name"
        name="name"
        required
        defaultValue={defaults.name}
        error={errors.name}
      />
      <SelectField
        label="Measures"
        name="quantity"
        defaultValue={defaults.quantity ?? "water_heat"}
        error={errors.quantity}
      >
        <LabelledOptions values={quantities} labels={quantityLabels} />
      </SelectField>
      <SelectField
        label="Energy carrier"
        name="carrier"
        defaultValue={defaults.carrier ?? "heat"}
        error={errors.carrier}
      >
        <LabelledOptions values={carriers} labels={carrierLabels} />
      </SelectField>
      <SelectField
        label="Orientation on the boundary"
        name="orientation"
        defaultValue={defaults.orientation ?? "import"}
        error={errors.orientation}
      >
        <option value="import">
          Import: measures what enters the site (sign kept)
        </option>
        <option value="export">
          Export: measures what leaves the site (sign flipped)
        </option>
      </SelectField>
      <SelectField
        label="Resolution (fixed once the meter has data)"
        name="intervalMinutes"
        defaultValue={String(
          defaults.intervalMinutes ?? DEFAULT_INTERVAL_MINUTES,
        )}
        error={errors.intervalMinutes}
      >
        {intervalResolutions.map((minutes) => (
          <option key={minutes} value={minutes}>
            {resolutionLabel(minutes)}
          </option>
        ))}
      </SelectField>
      <SelectField
        label="Parent meter (sub-metering)"
        name="parentMeterId"
        defaultValue={defaults.parentMeterId ?? ""}
        error={errors.parentMeterId}
      >
        <option value="">None: on the site boundary</option>
        {parents.map((p) => (
          <option key={p.id} value={p.id}>
            {p.code} — {p.name}
          </option>
        ))}
      </SelectField>
      <SelectField
        label="Position"
        name="position"
        defaultValue={defaults.position ?? "boundary"}
        error={errors.position}
      >
        <option value="boundary">
          On the boundary: counted as delivered or exported
        </option>
        <option value="internal">
          Inside the boundary: a plant&apos;s input or output, not counted
        </option>
      </SelectField>
      <Field
        label="Serial number"
        name="serial"
        defaultValue={defaults.serial}
        error={errors.serial}
      />
      <Field
        label="Installed on"
        name="installedAt"
        type="date"
        required
        defaultValue={dateValue(defaults.installedAt)}
        error={errors.installedAt}
      />
      <Field
        label="Multiplier (CT/VT ratio)"
        name="multiplier"
        inputMode="decimal"
        defaultValue={defaults.multiplier ?? "1"}
        error={errors.multiplier}
      />
      <Field
        label="Register roll-over point (kWh)"
        name="rolloverKwh"
        inputMode="decimal"
        hint="Registers only; empty when unknown"
        defaultValue={defaults.rolloverKwh ?? ""}
        error={errors.rolloverKwh}
      />
      <SelectField
        label="Flow sensor position"
        name="sensorAt"
        defaultValue={defaults.sensorAt ?? ""}
        error={errors.sensorAt}
      >
        <option value="">Not a water heat meter</option>
        <option value="flow">Flow pipe</option>
        <option value="return">Return pipe</option>
      </SelectField>
      <Field
        label="Default pressure (bar absolute)"
        name="defaultPressureBarAbs"
        inputMode="decimal"
        hint="Used when a reading gives none"
        defaultValue={defaults.defaultPressureBarAbs ?? ""}
        error={errors.defaultPressureBarAbs}
      />
      <Field
        label="Spike factor"
        name="spikeFactor"
        inputMode="decimal"
        hint="An interval above this multiple of the typical interval is flagged"
        defaultValue={defaults.spikeFactor ?? "10"}
        error={errors.spikeFactor}
      />
      <SelectField
        label="EN 1434 accuracy class (heat meters)"
        name="accuracyClass"
        defaultValue={
          defaults.accuracyClass ? String(defaults.accuracyClass) : ""
        }
        error={errors.accuracyClass}
      >
        <option value="">Not rated: no uncertainty band</option>
        <option value="1">Class 1</option>
        <option value="2">Class 2</option>
        <option value="3">Class 3</option>
      </SelectField>
      <Field
        label="Δθmin (K)"
        name="deltaThetaMinK"
        inputMode="decimal"
        hint="The smallest temperature difference the meter is rated for"
        defaultValue={defaults.deltaThetaMinK ?? ""}
        error={errors.deltaThetaMinK}
      />
      <Field
        label="qp (m³/h)"
        name="qpM3PerH"
        inputMode="decimal"
        hint="The flow sensor's permanent flow rate"
        defaultValue={defaults.qpM3PerH ?? ""}
        error={errors.qpM3PerH}
      />
    </div>
  );
}
