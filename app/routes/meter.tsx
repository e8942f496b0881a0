import { data, Form, Link, redirect } from "react-router";
import { idParam, notFound } from "~/auth/membership.server";
import { requirePermission } from "~/auth/page-access.server";
import { can } from "~/auth/permissions";
import { MeterFields } from "~/components/meter-fields";
import { GasSupplyCard } from "~/components/meter/gas-supply-card";
import {
  gasSupplyAction,
  gasSupplySection,
} from "~/gas/gas-supply-page.server";
import { MeterLastReading } from "~/components/meter-last-reading";
import { lastReadingOf } from "~/ingest/last-reading.server";
import { MeterPlantFaults } from "~/components/plant/meter-plant-faults";
import { meterPlantFaults } from "~/plant/plant-faults.server";
import {
  Badge,
  Button,
  Card,
  Field,
  Notice,
  PageHeader,
} from "~/components/ui";
import { parseForm } from "~/lib/forms";
import { dayUtc } from "~/lib/format";
import {
  carrierLabels,
  quantityLabels,
  resolutionLabel,
} from "~/sites/meter-kinds";
import {
  meterFormSchema,
  replaceSchema,
  retireSchema,
} from "~/sites/meter-schema";
import {
  getMeter,
  listSiteMeters,
  MeterRuleError,
  ResolutionFixedError,
  replaceMeter,
  retireMeter,
  updateMeter,
} from "~/sites/meters.server";
import { DuplicateNameError } from "~/sites/sites.server";
import { TankSection } from "~/components/tank/tank-section";
import { TANK_INTENTS } from "~/tanks/tank-forms";
import { tankPageAction, tankView } from "~/tanks/tank-page.server";
import type { Route } from "./+types/meter";

export const meta: Route.MetaFunction = ({ loaderData }) => [
  { title: `${loaderData?.meter.code ?? "Meter"} · Joulebook` },
];

export async function loader({ params, context }: Route.LoaderArgs) {
  const { organization, role } = requirePermission(context);
  const meter = await getMeter({
    organizationId: organization.id,
    meterId: idParam(params.meterId, "No such meter."),
  });
  if (!meter) notFound("No such meter.");
  const [siblings, last, plantFaults, tank, gasSupply] = await Promise.all([
    listSiteMeters({ organizationId: organization.id, siteId: meter.siteId }),
    lastReadingOf({ organizationId: organization.id, meterId: meter.id }),
    meterPlantFaults({
      organizationId: organization.id,
      siteId: meter.siteId,
      meterId: meter.id,
    }),
    meter.quantity === "liquid_fuel"
      ? tankView(organization.id, meter.id)
      : null,
    gasSupplySection(organization.id, meter),
  ]);
  return {
    tank,
    organization,
    meter,
    plantFaults,
    gasSupply,
    last: {
      at: last.at?.toISOString() ?? null,
      registerKwh: last.registerKwh,
      registerAt: last.registerAt?.toISOString() ?? null,
    },
    parents: siblings.filter((m) => m.id !== meter.id && !m.removedAt),
    replacement: meter.replacedByMeterId
      ? (siblings.find((m) => m.id === meter.replacedByMeterId) ?? null)
      : null,
    canManage: can(role, "sites.manage"),
    canEditReadings: can(role, "readings.edit"),
  };
}

type Result = {
  intent: string;
  errors: Record<string, string>;
  message?: string;
};
const fail = (intent: string, errors: Record<string, string>, status = 400) =>
  data<Result>({ intent, errors }, { status });

/** The tank's forms: dips and deliveries are readings; its settings, the meter's. */
async function tankAction(
  intent: string,
  formData: FormData,
  { params, context }: Pick<Route.ActionArgs, "params" | "context">,
) {
  const { organization, user } = requirePermission(
    context,
    intent === "tank-settings" ? "sites.manage" : "readings.edit",
  );
  const meter = await getMeter({
    organizationId: organization.id,
    meterId: idParam(params.meterId, "No such meter."),
  });
  if (!meter) notFound("No such meter.");
  const result = await tankPageAction(intent, formData, {
    organizationId: organization.id,
    actorUserId: user.id,
    meter,
  });
  const failed = Object.keys(result.errors).length > 0;
  return data<Result>(result, { status: failed ? 400 : 200 });
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const formData = await request.formData();
  const intent = String(formData.get("intent") ?? "");
  if (TANK_INTENTS.includes(intent))
    return tankAction(intent, formData, { params, context });
  const { organization, user } = requirePermission(context, "sites.manage");
  const meter = await getMeter({
    organizationId: organization.id,
    meterId: idParam(params.meterId, "No such meter."),
  });
  if (!meter) notFound("No such meter.");
  const scope = {
    organizationId: organization.id,
    actorUserId: user.id,
    meterId: meter.id,
  };
  const gas = await gasSupplyAction({
    organizationId: organization.id,
    meterId: meter.id,
    intent,
    formData,
    actor: { actorUserId: user.id },
  });
  if (gas) return data<Result>(gas.result, { status: gas.status });
  try {
    if (intent === "save-meter") {
      const form = parseForm(formData, meterFormSchema);
      if (!form.ok) return fail(intent, form.errors);
      const { intent: _i, ...input } = form.data;
      await updateMeter({ ...scope, siteId: meter.siteId, input });
      return data<Result>({ intent, errors: {}, message: "Meter saved." });
    }
    if (intent === "retire") {
      const form = parseForm(formData, retireSchema);
      if (!form.ok) return fail(intent, form.errors);
      await retireMeter({
        ...scope,
        removedAt: form.data.removedAt!,
        reason: form.data.reason,
      });
      return data<Result>({
        intent,
        errors: {},
        message: "Meter retired: readings after that date are refused.",
      });
    }
    if (intent === "replace") {
      const form = parseForm(formData, replaceSchema);
      if (!form.ok) return fail(intent, form.errors);
      const id = await replaceMeter({
        ...scope,
        code: form.data.code,
        serial: form.data.serial,
        swappedAt: form.data.swappedAt!,
        reason: form.data.reason,
      });
      throw redirect(`/o/${organization.id}/meters/${id}`);
    }
    return fail(intent, { form: "Unknown action." });
  } catch (error) {
    if (error instanceof DuplicateNameError)
      return fail(intent, { code: error.message }, 409);
    if (error instanceof ResolutionFixedError)
      return fail(intent, { intervalMinutes: error.message }, 409);
    if (error instanceof MeterRuleError)
      return fail(intent, { parentMeterId: error.message });
    throw error;
  }
}

/** A gas register counts m³ or hcf; every other register kWh. */
const registerUnitWords = (unit: "m3" | "hcf" | null) =>
  unit === "m3" ? "m³" : (unit ?? "kWh");

function ReasonField({ error }: { error?: string }) {
  return (
    <Field
      label="Reason (optional)"
      name="reason"
      maxLength={500}
      hint="Kept in the audit trail with the change."
      error={error}
    />
  );
}

export default function Meter({
  loaderData,
  actionData,
}: Route.ComponentProps) {
  const { meter, parents, canManage, organization, replacement, last } =
    loaderData;
  const result = actionData as Result | undefined;
  const errorsFor = (intent: string): Record<string, string | undefined> =>
    result?.intent === intent ? result.errors : {};
  const base = `/o/${organization.id}`;
  return (
    <>
      <PageHeader
        title={`${meter.code} · ${meter.name}`}
        description={
          <>
            {quantityLabels[meter.quantity]} · {carrierLabels[meter.carrier]} ·{" "}
            {meter.orientation === "import" ? "import (+)" : "export (−)"} ·{" "}
            {resolutionLabel(meter.intervalMinutes)} ·{" "}
            {meter.position === "internal" ? "inside the boundary · " : null}
            <Link
              className="font-semibold text-spruce-700 underline"
              to={`${base}/sites/${meter.siteId}`}
            >
              {meter.siteName}
            </Link>
          </>
        }
        actions={
          <Link
            to={`${base}/meters/${meter.id}/readings`}
            className="inline-flex min-h-10 items-center rounded-lg bg-spruce-700 px-4 font-semibold text-white hover:bg-spruce-800"
          >
            Readings
          </Link>
        }
      />
      <div className="flex flex-col gap-6">
        {result?.message ? (
          <Notice tone="success">{result.message}</Notice>
        ) : null}
        <MeterPlantFaults
          faults={loaderData.plantFaults}
          plantsLink={`/o/${organization.id}/sites/${meter.siteId}/plant`}
        />
        {/* A tank's figures are its dips, shown in its own section. */}
        {loaderData.tank ? null : (
          <MeterLastReading
            last={last}
            timeZone={meter.timeZone}
            registerUnit={registerUnitWords(
              loaderData.gasSupply?.settings.registerUnit ?? null,
            )}
          />
        )}
        {loaderData.gasSupply ? (
          <GasSupplyCard
            view={loaderData.gasSupply}
            canManage={canManage && !meter.removedAt}
            errors={errorsFor}
          />
        ) : null}
        {meter.quantity === "liquid_fuel" ? (
          <TankSection
            tank={loaderData.tank}
            canEdit={loaderData.canEditReadings}
            errorsFor={errorsFor}
          />
        ) : null}
        {meter.removedAt ? (
          <Notice tone="caution" title="Retired">
            Removed on {dayUtc(meter.removedAt)}.
            {replacement ? (
              <>
                {" "}
                Replaced by{" "}
                <Link
                  className="font-semibold underline"
                  to={`${base}/meters/${replacement.id}`}
                >
                  {replacement.code}
                </Link>
                .
              </>
            ) : null}
          </Notice>
        ) : null}
        {canManage ? (
          <>
            <Card aria-labelledby="meter-edit-heading">
              <h2 id="meter-edit-heading" className="text-lg">
                Settings
              </h2>
              <Form
                method="post"
                className="mt-4 flex flex-col gap-4"
                noValidate
              >
                {errorsFor("save-meter").form ? (
                  <Notice tone="error">{errorsFor("save-meter").form}</Notice>
                ) : null}
                <MeterFields
                  errors={errorsFor("save-meter")}
                  parents={parents}
                  defaults={meter}
                />
                <div>
                  <Button type="submit">Save meter</Button>
                </div>
              </Form>
            </Card>
            {!meter.removedAt ? (
              <div className="grid gap-6 md:grid-cols-2">
                <Card aria-labelledby="replace-heading">
                  <h2 id="replace-heading" className="text-lg">
                    Replace (meter swap)
                  </h2>
                  <p className="mt-1 text-ink-muted">
                    Retires this meter at the swap time and adds the new one
                    with the same settings. Its register starts afresh.
                  </p>
                  <Form
                    method="post"
                    className="mt-4 flex flex-col gap-4"
                    noValidate
                  >
                    <input type="hidden" name="intent" value="replace" />
                    <Field
                      label="New meter's code"
                      name="code"
                      required
                      error={errorsFor("replace").code}
                    />
                    <Field
                      label="New meter's serial number"
                      name="serial"
                      error={errorsFor("replace").serial}
                    />
                    <Field
                      label="Swapped on"
                      name="swappedAt"
                      type="date"
                      required
                      error={errorsFor("replace").swappedAt}
                    />
                    <ReasonField error={errorsFor("replace").reason} />
                    <div>
                      <Button type="submit" variant="secondary">
                        Replace meter
                      </Button>
                    </div>
                  </Form>
                </Card>
                <Card aria-labelledby="retire-heading">
                  <h2 id="retire-heading" className="text-lg">
                    Retire
                  </h2>
                  <p className="mt-1 text-ink-muted">
                    Readings after this date are refused; its history stays in
                    the ledger.
                  </p>
                  <Form
                    method="post"
                    className="mt-4 flex flex-col gap-4"
                    noValidate
                  >
                    <input type="hidden" name="intent" value="retire" />
                    <Field
                      label="Removed on"
                      name="removedAt"
                      type="date"
                      required
                      error={errorsFor("retire").removedAt}
                    />
                    <ReasonField error={errorsFor("retire").reason} />
                    <div>
                      <Button type="submit" variant="danger">
                        Retire meter
                      </Button>
                    </div>
                  </Form>
                </Card>
              </div>
            ) : null}
          </>
        ) : (
          <Card>
            <dl className="grid gap-3 sm:grid-cols-3">
              {[
                ["Serial", meter.serial || "—"],
                ["Multiplier", meter.multiplier],
                [
                  "Roll-over",
                  meter.rolloverKwh ? `${meter.rolloverKwh} kWh` : "—",
                ],
                ["Sensor", meter.sensorAt ?? "—"],
                ["Installed", dayUtc(meter.installedAt)],
                ["Resolution", resolutionLabel(meter.intervalMinutes)],
                ["Spike factor", meter.spikeFactor],
              ].map(([k, v]) => (
                <div key={k}>
                  <dt className="text-sm text-ink-muted">{k}</dt>
                  <dd className="font-semibold">{v}</dd>
                </div>
              ))}
            </dl>
            {meter.removedAt ? <Badge>retired</Badge> : null}
          </Card>
        )}
      </div>
    </>
  );
}
