import { useEffect, useMemo, useState } from "react";
import { useHydrated } from "~/lib/use-hydrated";

import { data, Form, Link, useActionData, useNavigation } from "react-router";
import { z } from "zod";
import { idParam, notFound, requireMembership } from "~/auth/membership.server";
import { can } from "~/auth/permissions";
import { CarpetPlot } from "~/components/readings/carpet-plot";
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
import { editInterval } from "~/ingest/edit-interval.server";
import { parseForm } from "~/lib/forms";
import { getMeter } from "~/sites/meters.server";
import type { Route } from "./+types/meter-readings";

export const meta: Route.MetaFunction = ({ loaderData }) => [
  { title: `Readings ${loaderData?.meter.code ?? ""} · Joulebook` },
];

export async function loader({ request, params }: Route.LoaderArgs) {
  const { organization, role } = await requireMembership(
    request,
    params.orgId,
    "readings.view",
  );
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
});

export async function action({ request, params }: Route.ActionArgs) {
  const { organization, user } = await requireMembership(
    request,
    params.orgId,
    "readings.edit",
  );
  const meter = await getMeter({
    organizationId: organization.id,
    meterId: idParam(params.meterId, "No such meter."),
  });
  if (!meter) notFound("No such meter.");
  const form = parseForm(await request.formData(), editSchema);
  if (!form.ok)
    return data({ errors: form.errors, saved: false }, { status: 400 });
  const edit = await editInterval({
    organizationId: organization.id,
    actorUserId: user.id,
    meter,
    hourStart: new Date(form.data.hourStart),
    energyKwh: form.data.energyKwh,
    reason: form.data.reason,
  });
  if (!edit.ok)
    return data(
      { errors: { hourStart: edit.reason }, saved: false },
      { status: 400 },
    );
  return { errors: {} as Record<string, string>, saved: true };
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
    ["Edited", String(edited)],
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

function EditPanel({
  selected,
  timeZone,
}: {
  selected: Interval | null;
  timeZone: string;
}) {
  const actionData = useActionData<typeof action>();
  const busy = useNavigation().state === "submitting";
  const errors: Record<string, string | undefined> = actionData?.errors ?? {};
  if (!selected)
    return (
      <p className="text-ink-muted">
        Select an hour in the table to correct it.
      </p>
    );
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
      key={selected.hour_start}
    >
      {actionData?.saved ? (
        <Notice tone="success">
          Saved as edited; the change and reason are in the audit log.
        </Notice>
      ) : null}
      {errors.form ? <Notice tone="error">{errors.form}</Notice> : null}
      <p>
        Correcting <strong>{label}</strong>: now{" "}
        {Number(selected.energy_kwh).toLocaleString("en-GB")} kWh (
        {selected.quality}).
      </p>
      <input type="hidden" name="intent" value="edit" />
      <input type="hidden" name="hourStart" value={selected.hour_start} />
      <Field
        label="Corrected energy (kWh, signed)"
        name="energyKwh"
        inputMode="decimal"
        defaultValue={selected.energy_kwh}
        error={errors.energyKwh ?? errors.hourStart}
      />
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
  const [selected, setSelected] = useState<Interval | null>(null);
  // Charts and the grid measure the page, so they render in the browser only.
  const mounted = useHydrated();
  const navigation = useNavigation();
  // After a correction is saved, fetch the hour again so the table shows it.
  useEffect(() => {
    if (navigation.state === "idle" && mounted) void reload();
  }, [navigation.state, mounted, reload]);
  const intervals = page?.intervals ?? [];
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
                  ? `${range ? "Range" : "Live"} · updated ${updatedAt.toLocaleTimeString("en-GB")}`
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
                Outlined cells are estimated or edited.
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
                onSelect={setSelected}
              />
            </Card>
            {canEdit ? (
              <Card aria-labelledby="edit-heading">
                <h2 id="edit-heading" className="text-lg">
                  Correct an hour
                </h2>
                <div className="mt-3">
                  <EditPanel selected={selected} timeZone={meter.timeZone} />
                </div>
              </Card>
            ) : null}
          </>
        ) : null}
      </div>
    </>
  );
}
