import { Field } from "./ui";

/** The fields of a site, for the create and edit forms. */
export function SiteFields({
  errors,
  defaults,
}: {
  errors: Record<string, string | undefined>;
  defaults?: {
    name?: string;
    timeZone?: string;
    floorAreaM2?: string | null;
    degreeDayBaseC?: string;
    address?: string;
  };
}) {
  return (
    <div className="grid gap-4 sm:grid-cols-2">
      <input type="hidden" name="intent" value="save-site" />
      <Field
        label="Name"
        name="name"
        required
        defaultValue={defaults?.name}
        error={errors.name}
      />
      <Field
        label="Time zone"
        name="timeZone"
        required
        defaultValue={defaults?.timeZone ?? "Europe/London"}
        hint="IANA name, e.g. Europe/London"
        error={errors.timeZone}
      />
      <Field
        label="Floor area (m²)"
        name="floorAreaM2"
        inputMode="decimal"
        defaultValue={defaults?.floorAreaM2 ?? ""}
        error={errors.floorAreaM2}
      />
      <Field
        label="Degree day base temperature (°C)"
        name="degreeDayBaseC"
        inputMode="decimal"
        defaultValue={defaults?.degreeDayBaseC ?? "15.5"}
        error={errors.degreeDayBaseC}
      />
      <Field
        label="Address"
        name="address"
        className="sm:col-span-2"
        defaultValue={defaults?.address}
        error={errors.address}
      />
    </div>
  );
}
