import { useEffect, useMemo, useState } from "react";
import { useHydrated } from "~/lib/use-hydrated";

import { data, Form, Link, useActionData, useNavigation } from "react-router";
import { z } from "zod";
import { idParam, notFound } from "~/auth/membership.server";
import { requirePermission } from "~/auth/page-access.server";
import { can } from "~/auth/permissions";
import { CarpetPlot } from "~/components/readings/carpet-plot";
import { newestReadingsStatus } from "~/components/readings/freshness";
import { IntervalGrid } from "~/components/readings/interval-grid";
import { LoadProfile } from "~/components/readings/load-profile";
import {
  useIntervals,
  type Interval,
} from "~/components/readings/use-intervals";
import {
  Button,
  Card,
  EmptyState,
  Field,
  Notice,
  PageHeader,
} from "~/components/ui";
import {
  CONFIRMED_SPIKE_FLAG,
  confirmLabel,
  correctionHint,
  formatKwh,
} from "~/ingest/correction-rules";
import { editInterval } from "~/ingest/edit-interval.server";
import { parseForm } from "~/lib/forms";
import { getMeter } from "~/sites/meters.server";
import type { Route } from "./+types/meter-readings";

export const meta: Route.MetaFunction = ({ loaderData }) => [
  { title: `Readings ${loaderData?.meter.code ?? ""} · Joulebook` },
];

export async function loader({ params, context }: Route.LoaderArgs) {
  const { organization, role } = requirePermission(context, "readings.view");
  const meter = await getMeter({
    organizationId: organization.id,
    meterId: idParam(params.meterId, "No such meter."),
  });
  if (!meter) notFound("No such meter.");
  return {
    organization,
    meter: {
      id: meter.id,
      code: meter.code,
      name: meter.name,
      siteId: meter.siteId,
      siteName: meter.siteName,
      timeZone: meter.timeZone,
      carrier: meter.carrier,
      orientation: meter.orientation,
    },
    canEdit: can(role, "readings.edit"),
  };
}

const editSchema = z.strictObject({
  intent: z.literal("edit"),
  hourStart: z.iso.datetime({
    offset: true,
    error: "Choose an hour in the table.",
  }),
  energyKwh: z
    .string()
    .trim()
    .min(1, "Enter the corrected energy.")
    .max(24)
    .transform((v, ctx) => {
      const n = Number(v);
      if (!Number.isFinite(n) || Math.abs(n) > 1e9) {
        ctx.addIssue({
          code: "custom",
          message:
            "Enter a number of kWh (negative for energy leaving the site).",
        });
        return z.NEVER;
      }
      return n;
    }),
  reason: z
    .string()
    .trim()
    .min(5, "Say why, in at least 5 characters: it goes to the audit log.")
    .max(500, "Use at most 500 characters."),
  /**
   * The value the person confirmed after being shown how far it lies from
   * the meter's history: a confirmation of another value does not count.
   */
  confirmSpike: z.string().trim().max(24).optional(),
});

type EditAnswer = {
  errors: Record<string, string>;
  saved: { hourStart: string; flags: string[] } | null;
  /** The value to confirm, when it lies far outside the meter's history. */
  confirm: { hourStart: string; energyKwh: string } | null;
};

const refusal = (answer: Partial<EditAnswer>) =>
  data<EditAnswer>(
    { errors: {}, saved: null, confirm: null, ...answer },
    { status: 400 },
  );

export async function action({ request, params, context }: Route.ActionArgs) {
  const { organization, user } = requirePermission(context, "readings.edit");
  const meter = await getMeter({
    organizationId: organization.id,
    meterId: idParam(params.meterId, "No such meter."),
  });
  if (!meter) notFound("No such meter.");
  const form = parseForm(await request.formData(), editSchema);
  if (!form.ok) return refusal({ errors: form.errors });
  const { hourStart, energyKwh, reason, confirmSpike } = form.data;
  const edit = await editInterval({
    organizationId: organization.id,
    actorUserId: user.id,
    meter: { ...meter, spikeFactor: Number(meter.spikeFactor) },
    hourStart: new Date(hourStart),
    energyKwh,
    reason,
    confirmedSpike:
      confirmSpike !== undefined && Number(confirmSpike) === energyKwh,
  });
  if (!edit.ok)
    return refusal({
      errors: { [edit.field]: edit.reason },
      confirm: edit.jump ? { hourStart, energyKwh: String(energyKwh) } : null,
    });
  return data<EditAnswer>({
    errors: {},
    saved: { hourStart, flags: edit.flags },
    confirm: null,
  });
}

function monthRange(month: string): { from: string; to: string } | null {
  if (!/^\d{4}-\d{2}$/.test(month)) return null;
  const [y, m] = month.split("-").map(Number);
  return {
    from: new Date(Date.UTC(y, m - 1, 1)).toISOString(),
    to: new Date(Date.UTC(y, m, 1)).toISOString(),
  };
}

function Summary({ intervals }: { intervals: Interval[] }) {
  const total = intervals.reduce((s, i) => s + Number(i.energy_kwh), 0);
  const estimated = intervals.filter((i) => i.quality === "estimated").length;
  const edited = intervals.filter((i) => i.quality === "edited").length;
  const flagged = intervals.filter((i) => i.flags.length > 0).length;
  const items = [
    ["Hours", intervals.length.toLocaleString("en-GB")],
    [
      "Signed total",
      `${total.toLocaleString("en-GB", { maximumFractionDigits: 1 })} kWh`,
    ],
    [
      "Estimated",
      intervals.length
        ? `${((100 * estimated) / intervals.length).toFixed(1)} %`
        : "—",
    ],
    ["Corrected", String(edited)],
    ["Flagged", String(flagged)],
  ];
  return (
    <dl className="grid grid-cols-2 gap-3 sm:grid-cols-5">
      {items.map(([k, v]) => (
        <div key={k} className="rounded-lg bg-paper px-3 py-2">
          <dt className="text-sm text-ink-muted">{k}</dt>
          <dd className="text-lg font-semibold tabular-nums">{v}</dd>
        </div>
      ))}
    </dl>
  );
}

/** "250000.000000" as a person would type it: "250000". Exact, no float. */
function withoutTrailingZeros(decimal: string): string {
  return decimal.includes(".") ? decimal.replace(/\.?0+$/, "") : decimal;
}

/** Quality in the energy manager's words. */
const qualityWords: Record<Interval["quality"], string> = {
  measured: "actual reading",
  estimated: "estimated",
  edited: "corrected by hand",
  missing: "missing",
};

function EditPanel({
  selected,
  timeZone,
  hint,
}: {
  selected: Interval | null;
  timeZone: string;
  /** What the meter's hours are and which sign they take. */
  hint: string;
}) {
  const actionData = useActionData<typeof action>();
  const busy = useNavigation().state === "submitting";
  if (!selected)
    return (
      <p className="text-ink-muted">
        Select an hour in the table to correct it.
      </p>
    );
  // An answer is about the hour it was posted for, not the one selected since.
  const forThisHour = actionData?.saved
    ? actionData.saved.hourStart === selected.hour_start
    : actionData?.confirm
      ? actionData.confirm.hourStart === selected.hour_start
      : true;
  const answer = forThisHour ? actionData : undefined;
  const errors: Record<string, string | undefined> = answer?.errors ?? {};
  const label = new Intl.DateTimeFormat("en-GB", {
    timeZone,
    dateStyle: "full",
    timeStyle: "short",
  }).format(new Date(selected.hour_start));
  return (
    <Form
      method="post"
      className="flex flex-col gap-4"
      noValidate
      // A saved value remounts the form, so its fields start from the new value.
      key={`${selected.hour_start}|${selected.energy_kwh}|${selected.quality}`}
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
        {formatKwh(Number(selected.energy_kwh))} kWh,{" "}
        {qualityWords[selected.quality]}.
      </p>
      <input type="hidden" name="intent" value="edit" />
      <input type="hidden" name="hourStart" value={selected.hour_start} />
      <Field
        label="Corrected energy (kWh)"
        name="energyKwh"
        inputMode="decimal"
        hint={hint}
        defaultValue={withoutTrailingZeros(selected.energy_kwh)}
        error={errors.energyKwh ?? errors.hourStart}
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

export default function MeterReadings({ loaderData }: Route.ComponentProps) {
  const { meter, organization, canEdit } = loaderData;
  const [month, setMonth] = useState("");
  const range = useMemo(() => monthRange(month), [month]);
  const { page, error, loading, updatedAt, reload } = useIntervals(
    organization.id,
    meter.id,
    range,
  );
  // The hour, not the row: after a correction the grid's data is fetched
  // again, and the panel must show the new row, not the one clicked.
  const [selectedHour, setSelectedHour] = useState<string | null>(null);
  // Charts and the grid measure the page, so they render in the browser only.
  const mounted = useHydrated();
  const navigation = useNavigation();
  // After a correction is saved, fetch the hour again so the table shows it.
  useEffect(() => {
    if (navigation.state === "idle" && mounted) void reload();
  }, [navigation.state, mounted, reload]);
  const intervals = page?.intervals ?? [];
  const selected = intervals.find((i) => i.hour_start === selectedHour) ?? null;
  return (
    <>
      <PageHeader
        title={`${meter.code} · ${meter.name}`}
        description={
          <>
            Hourly intervals at{" "}
            <Link
              className="font-semibold text-spruce-700 underline"
              to={`/o/${organization.id}/sites/${meter.siteId}`}
            >
              {meter.siteName}
            </Link>
            , in the site's time zone ({meter.timeZone}).
          </>
        }
      />
      <div className="flex flex-col gap-6">
        <Card>
          <div className="flex flex-wrap items-end justify-between gap-4">
            <Field
              label="Month"
              name="month"
              type="month"
              value={month}
              onChange={(e) => setMonth(e.target.value)}
              hint="Empty: the newest week, refreshed as readings arrive"
            />
            <p className="text-sm text-ink-muted" role="status">
              {loading
                ? "Loading…"
                : updatedAt
                  ? `${range ? "Range" : newestReadingsStatus(page?.latest ?? null, updatedAt, meter.timeZone).text} · updated ${updatedAt.toLocaleTimeString("en-GB")}`
                  : ""}
            </p>
          </div>
          {error ? (
            <div className="mt-3">
              <Notice tone="error">{error}</Notice>
            </div>
          ) : null}
          {page && intervals.length > 0 ? (
            <div className="mt-4">
              <Summary intervals={intervals} />
            </div>
          ) : null}
        </Card>
        {!loading && intervals.length === 0 && !error ? (
          <EmptyState title="No intervals in this range">
            Readings posted by a gateway or uploaded as CSV appear here within
            seconds.
          </EmptyState>
        ) : null}
        {mounted && intervals.length > 0 ? (
          <>
            <Card aria-labelledby="profile-heading">
              <h2 id="profile-heading" className="text-lg">
                Load profile
              </h2>
              <LoadProfile
                intervals={intervals}
                timeZone={meter.timeZone}
                carrier={meter.carrier}
              />
            </Card>
            <Card aria-labelledby="carpet-heading">
              <h2 id="carpet-heading" className="text-lg">
                Carpet plot
              </h2>
              <p className="text-sm text-ink-muted">
                Each row a day, each column an hour; darker is more energy.
                Outlined cells are estimated or corrected.
              </p>
              <CarpetPlot
                intervals={intervals}
                timeZone={meter.timeZone}
                carrier={meter.carrier}
              />
            </Card>
            <Card aria-labelledby="grid-heading">
              <h2 id="grid-heading" className="text-lg">
                Intervals
              </h2>
              <IntervalGrid
                intervals={intervals}
                timeZone={meter.timeZone}
                onSelect={(row) => setSelectedHour(row?.hour_start ?? null)}
              />
            </Card>
            {canEdit ? (
              <Card aria-labelledby="edit-heading">
                <h2 id="edit-heading" className="text-lg">
                  Correct an hour
                </h2>
                <div className="mt-3">
                  <EditPanel
                    selected={selected}
                    timeZone={meter.timeZone}
                    hint={correctionHint(meter)}
                  />
                </div>
              </Card>
            ) : null}
          </>
        ) : null}
      </div>
    </>
  );
}
