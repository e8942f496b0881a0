import { data, Form, Link } from "react-router";
import { z } from "zod";
import { notFound } from "~/auth/membership.server";
import { requirePermission } from "~/auth/page-access.server";
import { ConfirmRevoke } from "~/components/confirm-revoke";
import { RelativeTime } from "~/components/relative-time";
import {
  Badge,
  Button,
  buttonClass,
  Card,
  EmptyState,
  Field,
  Notice,
  PageHeader,
} from "~/components/ui";
import { listGateways } from "~/gateways/list-gateways.server";
import {
  createGateway,
  revokeGateway,
} from "~/gateways/manage-gateways.server";
import { parseForm } from "~/lib/forms";
import { idField } from "~/lib/ids";
import { revokeBeingConfirmed } from "~/lib/revoke-confirmation";
import { dateTimeUtc } from "~/lib/format";
import type { Route } from "./+types/gateways";

export const meta: Route.MetaFunction = () => [
  { title: "Gateways · Joulebook" },
];

const createSchema = z.strictObject({
  intent: z.literal("create"),
  name: z
    .string()
    .trim()
    .min(1, "Name the gateway, e.g. its location.")
    .max(80, "Use at most 80 characters."),
});
// Revoking cuts a gateway off at once, so it takes two steps: "Revoke…"
// opens a confirmation naming the gateway and when it was last seen, and only
// that form sends `confirm`. A stray POST without it (a replayed form, a
// script) is refused and changes nothing.
const revokeSchema = z.strictObject({
  intent: z.literal("revoke"),
  gatewayId: idField("Unknown gateway."),
  confirm: z.literal("yes", {
    error: "Confirm the revocation first: choose Revoke… beside the gateway.",
  }),
});

export async function loader({ request, context }: Route.LoaderArgs) {
  const { organization } = requirePermission(context, "gateways.manage");
  const gateways = await listGateways({ organizationId: organization.id });
  const confirming = revokeBeingConfirmed(request, gateways);
  return { gateways, confirming, now: new Date().toISOString() };
}

type Result = {
  intent: string;
  errors: Record<string, string>;
  key?: string;
  name?: string;
  message?: string;
};

export async function action({ request, context }: Route.ActionArgs) {
  const { organization, user } = requirePermission(context, "gateways.manage");
  const formData = await request.formData();
  const intent = String(formData.get("intent") ?? "");
  const scope = { organizationId: organization.id, actorUserId: user.id };
  if (intent === "create") {
    const form = parseForm(formData, createSchema);
    if (!form.ok)
      return data<Result>({ intent, errors: form.errors }, { status: 400 });
    const { key } = await createGateway({ ...scope, name: form.data.name });
    return data<Result>({ intent, errors: {}, key, name: form.data.name });
  }
  const form = parseForm(formData, revokeSchema);
  if (!form.ok)
    return data<Result>({ intent, errors: form.errors }, { status: 400 });
  if (!(await revokeGateway({ ...scope, gatewayId: form.data.gatewayId })))
    notFound("No such gateway.");
  return data<Result>({
    intent,
    errors: {},
    message: "Gateway revoked: its key is refused from now on.",
  });
}

type GatewayRow = Route.ComponentProps["loaderData"]["gateways"][number];

/** The second step of revoking: what is cut off, and since when it was heard. */
function ConfirmRevokeGateway({
  gateway,
  now,
}: {
  gateway: GatewayRow;
  now: string;
}) {
  return (
    <ConfirmRevoke
      id={gateway.id}
      name={gateway.name}
      fields={{ gatewayId: gateway.id }}
    >
      {gateway.lastSeenAt ? (
        <>
          It was last seen <RelativeTime at={gateway.lastSeenAt} now={now} /> (
          {dateTimeUtc(gateway.lastSeenAt)}).
        </>
      ) : (
        "It has never posted a reading."
      )}{" "}
      Its key ({gateway.keyPrefix}…) is refused from the moment you confirm: the
      readings it sends are turned away until it is set up as a new gateway with
      a new key. This cannot be undone.
    </ConfirmRevoke>
  );
}

export default function Gateways({
  loaderData,
  actionData,
}: Route.ComponentProps) {
  const result = actionData as Result | undefined;
  const errors: Record<string, string | undefined> =
    result?.intent === "create" ? result.errors : {};
  const revokeError =
    result?.intent === "revoke"
      ? Object.values(result.errors).join(" ") || undefined
      : undefined;
  return (
    <>
      <PageHeader
        title="Gateways"
        description="Machines that post meter readings. Each has its own key, shown once."
      />
      <div className="flex flex-col gap-6">
        {result?.key ? (
          <Notice tone="success" title={`Key for ${result.name}: copy it now`}>
            <p>
              This is the only time the key is shown. Store it in the gateway's
              configuration.
            </p>
            <p
              className="mt-2 break-all rounded bg-surface px-3 py-2 font-mono text-ink"
              data-testid="new-gateway-key"
            >
              {result.key}
            </p>
          </Notice>
        ) : null}
        {result?.message ? (
          <Notice tone="success">{result.message}</Notice>
        ) : null}
        {revokeError ? <Notice tone="error">{revokeError}</Notice> : null}
        <Card aria-labelledby="new-gateway-heading">
          <h2 id="new-gateway-heading" className="text-lg">
            Add a gateway
          </h2>
          <Form
            method="post"
            className="mt-4 flex flex-col gap-4 sm:flex-row sm:items-end"
            noValidate
          >
            <input type="hidden" name="intent" value="create" />
            <Field
              label="Gateway name"
              name="name"
              required
              className="grow"
              error={errors.name}
            />
            <Button type="submit">Create and show key</Button>
          </Form>
        </Card>
        <Card aria-labelledby="gateway-list-heading">
          <h2 id="gateway-list-heading" className="text-lg">
            All gateways
          </h2>
          {loaderData.gateways.length === 0 ? (
            <div className="mt-3">
              <EmptyState title="No gateways yet">
                Create one above; it gets a key to post readings.
              </EmptyState>
            </div>
          ) : (
            <ul className="mt-2 divide-y divide-line">
              {loaderData.gateways.map((g) => (
                <li key={g.id} className="py-3">
                  <div className="flex flex-wrap items-center justify-between gap-3">
                    <div>
                      <p className="font-semibold">{g.name}</p>
                      <p className="font-mono text-sm text-ink-muted">
                        {g.keyPrefix}…
                      </p>
                    </div>
                    <div className="flex items-center gap-4">
                      <span className="text-sm text-ink-muted">
                        {g.lastSeenAt ? (
                          <>
                            Last seen{" "}
                            <RelativeTime
                              at={g.lastSeenAt}
                              now={loaderData.now}
                            />
                          </>
                        ) : (
                          "Never seen"
                        )}
                      </span>
                      {g.revokedAt ? (
                        <Badge tone="danger">Revoked</Badge>
                      ) : loaderData.confirming === g.id ? null : (
                        <Link
                          to={`?revoke=${g.id}`}
                          preventScrollReset
                          className={buttonClass("danger")}
                          aria-label={`Revoke ${g.name}…`}
                        >
                          Revoke…
                        </Link>
                      )}
                    </div>
                  </div>
                  {loaderData.confirming === g.id ? (
                    <ConfirmRevokeGateway gateway={g} now={loaderData.now} />
                  ) : null}
                </li>
              ))}
            </ul>
          )}
        </Card>
      </div>
    </>
  );
}
