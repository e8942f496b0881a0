import { Form, useActionData, useNavigation } from "react-router";
import { Button, Field, Notice } from "~/components/ui";
import { CONFIRMED_SPIKE_FLAG, confirmLabel } from "~/ingest/correction-rules";
import type { EditAnswer } from "~/ingest/interval-edit-form";
import { dateTimeIn, decimalAsTyped, formatHourKwh } from "~/lib/format";
import type { Interval } from "./use-intervals";

/** Quality in the energy manager's words. */
const qualityWords: Record<Interval["quality"], string> = {
  measured: "actual reading",
  estimated: "estimated",
  edited: "corrected by hand",
  missing: "missing",
};

/**
 * The selected hour's correction: a new value and a reason, and, for a value
 * far outside the meter's history, a confirmation.
 */
export function EditPanel({
  selected,
  timeZone,
  hint,
}: {
  selected: Interval | null;
  timeZone: string;
  /** What the meter's hours are and which sign they take. */
  hint: string;
}) {
  const actionData = useActionData<EditAnswer>();
  const busy = useNavigation().state === "submitting";
  if (!selected)
    return (
      <p className="text-ink-muted">
        Select an interval in the table to correct it.
      </p>
    );
  // An answer is about the hour it was posted for, not the one selected since.
  const forThisHour = actionData?.saved
    ? actionData.saved.intervalStart === selected.start
    : actionData?.confirm
      ? actionData.confirm.intervalStart === selected.start
      : true;
  const answer = forThisHour ? actionData : undefined;
  const errors: Record<string, string | undefined> = answer?.errors ?? {};
  const label = dateTimeIn(selected.start, timeZone);
  return (
    <Form
      method="post"
      className="flex flex-col gap-4"
      noValidate
      // A saved value remounts the form, so its fields start from the new value.
      key={`${selected.start}|${selected.energy_kwh}|${selected.quality}`}
    >
      {answer?.saved ? (
        <Notice tone="success">
          {answer.saved.flags.includes(CONFIRMED_SPIKE_FLAG)
            ? `Saved as corrected by hand and flagged as a confirmed spike (${CONFIRMED_SPIKE_FLAG}); the change, the reason and your confirmation are in the audit log.`
            : "Saved as corrected by hand; the change and the reason are in the audit log."}
        </Notice>
      ) : null}
      {errors.form ? <Notice tone="error">{errors.form}</Notice> : null}
      <p>
        Correcting <strong>{label}</strong>: now{" "}
        {formatHourKwh(Number(selected.energy_kwh))} kWh,{" "}
        {qualityWords[selected.quality]}.
      </p>
      <input type="hidden" name="intent" value="edit" />
      <input type="hidden" name="intervalStart" value={selected.start} />
      <Field
        label="Corrected energy (kWh)"
        name="energyKwh"
        inputMode="decimal"
        hint={hint}
        defaultValue={decimalAsTyped(selected.energy_kwh)}
        error={errors.energyKwh ?? errors.intervalStart}
      />
      {answer?.confirm ? (
        <label className="flex items-start gap-2 font-semibold">
          <input
            type="checkbox"
            name="confirmSpike"
            value={answer.confirm.energyKwh}
            className="mt-1 h-5 w-5 accent-spruce-700"
          />
          {confirmLabel(Number(answer.confirm.energyKwh))}
        </label>
      ) : null}
      <Field label="Reason" name="reason" required error={errors.reason} />
      <div>
        <Button type="submit" disabled={busy}>
          {busy ? "Saving…" : "Save correction"}
        </Button>
      </div>
    </Form>
  );
}
