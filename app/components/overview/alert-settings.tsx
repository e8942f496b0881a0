import { Form } from "react-router";
import type { AlertPreferences } from "~/alerts/alert-settings.server";
import { SectionCard } from "~/components/section-card";
import { Button, Field, Notice } from "~/components/ui";

/** The signed-in member's own alert e-mails for this organisation. */
export function AlertSettings({
  alerts,
  errors,
  saved,
}: {
  alerts: AlertPreferences;
  errors: Record<string, string | undefined>;
  saved: boolean;
}) {
  const options = [
    ["silentMeter", "A meter sends no data", alerts.silentMeter],
    [
      "residual",
      "Sub-meters miss their parent by more than the tolerance",
      alerts.residual,
    ],
    ["monthReady", "Last month is ready to close", alerts.monthReady],
    [
      "plantFault",
      "A plant's month is beyond what the laws allow (a metering fault)",
      alerts.plantFault,
    ],
  ] as const;
  return (
    <SectionCard headingId="alerts-heading" title="Your alert e-mails">
      <p className="text-sm text-ink-muted">
        One e-mail per check, listing the conditions that started; none again
        until each has cleared.
      </p>
      <Form method="post" className="mt-3 flex flex-col gap-3" noValidate>
        {saved ? <Notice tone="success">Alert settings saved.</Notice> : null}
        <input type="hidden" name="intent" value="alerts" />
        {options.map(([name, label, checked]) => (
          <label key={name} className="flex items-center gap-2">
            <input
              type="checkbox"
              name={name}
              defaultChecked={checked}
              className="h-5 w-5 accent-spruce-700"
            />
            {label}
          </label>
        ))}
        <Field
          label="No data for (hours)"
          name="silentHours"
          inputMode="numeric"
          defaultValue={String(alerts.silentHours)}
          error={errors.silentHours}
          className="max-w-48"
        />
        <div>
          <Button type="submit" variant="secondary">
            Save alert settings
          </Button>
        </div>
      </Form>
    </SectionCard>
  );
}
