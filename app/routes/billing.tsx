import { data, Form, Link, redirect, useNavigation } from "react-router";
import { z } from "zod";
import { requirePermission } from "~/auth/page-access.server";
import { can } from "~/auth/permissions";
import {
  BillingRuleError,
  openBillingPortal,
  startCheckout,
} from "~/billing/checkout.server";
import { billingOverview } from "~/billing/overview.server";
import { anyBeingPrepared, invoiceRow } from "~/billing/invoice-display";
import { formatMoney, UNIT_PRICE_MINOR } from "~/billing/plan";
import {
  lookUpAfterCheckout,
  reconcileOrganization,
  type ReconcileOutcome,
} from "~/billing/reconcile.server";
import { isStripeError } from "~/billing/stripe.server";
import {
  Badge,
  Button,
  Card,
  EmptyState,
  Notice,
  PageHeader,
} from "~/components/ui";
import { parseForm } from "~/lib/forms";
import { dateTimeUtc, dayUtc } from "~/lib/times";
import type { Route } from "./+types/billing";

export const meta: Route.MetaFunction = () => [
  { title: "Billing · Joulebook" },
];

const attemptField = z.uuid("Reload the page and try again.");
/** Both send the browser to Stripe: Checkout to subscribe, the portal to manage. */
const goToStripeSchema = z.strictObject({
  intent: z.enum(["subscribe", "portal"]),
  attempt: attemptField,
});
const reconcileSchema = z.strictObject({ intent: z.literal("reconcile") });

export async function loader({ request, context }: Route.LoaderArgs) {
  const { organization, role } = requirePermission(context, "billing.view");
  const checkout = new URL(request.url).searchParams.get("checkout");
  // Back from a paid Checkout: find the subscription in Stripe now if its
  // webhook has not arrived (or was lost).
  if (checkout === "done") await lookUpAfterCheckout(organization.id);
  return {
    organization,
    ...(await billingOverview(organization.id)),
    canManage: can(role, "billing.manage"),
    checkout: checkout === "done" || checkout === "cancelled" ? checkout : null,
  };
}

type ActionResult = { intent: string; error?: string; message?: string };

const fail = (intent: string, error: string, status: number) =>
  data<ActionResult>({ intent, error }, { status });

const sites = (n: number | null) => `${n} site${n === 1 ? "" : "s"}`;

function describeReconcile(outcome: ReconcileOutcome): string {
  const linked = outcome.linked
    ? "Found a subscription in Stripe that had not reached Joulebook, and linked it. "
    : "";
  switch (outcome.result) {
    case "repaired":
      return `${linked}Stripe billed ${sites(outcome.found)}; it now bills ${outcome.expected}, the metered-site count.`;
    case "in_step":
      return `${linked}Stripe bills ${sites(outcome.expected)}, the same as the metered-site count.`;
    case "ended":
      return "The subscription has ended in Stripe, so nothing is billed. Subscribe again to restart the plan.";
    case "no_subscription":
      return "There is no subscription to check yet.";
    default:
      return "The payment service did not answer; nothing changed. Try again in a minute.";
  }
}

async function runIntent(
  intent: string,
  formData: FormData,
  organizationId: string,
) {
  if (intent === "subscribe" || intent === "portal") {
    const form = parseForm(formData, goToStripeSchema);
    if (!form.ok) return fail(intent, Object.values(form.errors)[0], 400);
    const go = intent === "subscribe" ? startCheckout : openBillingPortal;
    throw redirect(
      await go({ organizationId, attempt: form.data.attempt }),
      303,
    );
  }
  if (intent === "reconcile") {
    const form = parseForm(formData, reconcileSchema);
    if (!form.ok) return fail(intent, Object.values(form.errors)[0], 400);
    const outcome = await reconcileOrganization(organizationId);
    if (outcome.result === "failed")
      return fail(intent, describeReconcile(outcome), 502);
    return data<ActionResult>({ intent, message: describeReconcile(outcome) });
  }
  return fail(intent, "Unknown action.", 400);
}

export async function action({ request, context }: Route.ActionArgs) {
  const { organization } = requirePermission(context, "billing.manage");
  const formData = await request.formData();
  const intent = String(formData.get("intent") ?? "");
  try {
    return await runIntent(intent, formData, organization.id);
  } catch (error) {
    if (error instanceof BillingRuleError)
      return fail(intent, error.message, 409);
    if (isStripeError(error)) {
      console.error(`[billing] ${intent} failed:`, error.message);
      return fail(
        intent,
        "The payment service did not answer; nothing was charged or changed. Try again in a minute.",
        502,
      );
    }
    throw error;
  }
}

type LoaderData = Route.ComponentProps["loaderData"];

const day = (d: Date | string | null) => (d ? dayUtc(d) : "—");

const daysLeft = (n: number) => `${n} day${n === 1 ? "" : "s"} left`;

const standingLabels = {
  trial: { label: "Free trial", tone: "frost" },
  trial_ended: { label: "Trial ended", tone: "danger" },
  active: { label: "Active", tone: "spruce" },
  past_due: { label: "Past due", tone: "danger" },
  canceled: { label: "Cancelled", tone: "neutral" },
} as const;

function StandingText({ data: d }: { data: LoaderData }) {
  const { standing, account } = d;
  const grace = day(standing.graceEndsAt);
  switch (standing.kind) {
    case "trial":
      return (
        <>
          <p>
            Free until <strong>{day(standing.trialEndsAt)}</strong> (
            {daysLeft(standing.trialDaysLeft ?? 0)}). No card is needed during
            the trial.
          </p>
          <p className="mt-2 text-sm text-ink-muted">
            Subscribing ends the trial: the paid plan starts at once and the
            first month is charged on the day you subscribe.
          </p>
        </>
      );
    case "active":
      return account?.cancelAtPeriodEnd ? (
        <p>
          Paid up. The subscription was cancelled and ends on{" "}
          <strong>{day(account.currentPeriodEnd)}</strong>; nothing more will be
          charged.
        </p>
      ) : (
        <p>
          Paid monthly. The next period starts on{" "}
          <strong>{day(account?.currentPeriodEnd ?? null)}</strong>.
        </p>
      );
    case "past_due":
      return (
        <p>
          A renewal payment failed on {day(account?.pastDueSince ?? null)}.
          Stripe tries the card again over the coming days; update the payment
          method to settle it now.{" "}
          {standing.sitesBlocked
            ? "The grace period has ended, so new sites cannot be added until it is paid."
            : `New sites can be added until ${grace}.`}{" "}
          Readings keep arriving and nothing stored is lost.
        </p>
      );
    case "trial_ended":
      return (
        <p>
          The free trial ended on {day(standing.trialEndsAt)} without a
          subscription.{" "}
          {standing.sitesBlocked
            ? "The grace period has ended, so new sites cannot be added until you subscribe."
            : `New sites can be added until ${grace}; subscribe before then.`}{" "}
          Readings keep arriving and nothing stored is lost.
        </p>
      );
    default:
      return (
        <p>
          The subscription has ended.{" "}
          {standing.sitesBlocked
            ? "New sites cannot be added until you subscribe again."
            : `New sites can be added until ${grace}.`}{" "}
          Readings keep arriving and nothing stored is lost.
        </p>
      );
  }
}

function PlanCard({ data: d }: { data: LoaderData }) {
  const badge = standingLabels[d.standing.kind];
  return (
    <Card aria-labelledby="plan-heading" className="flex flex-col gap-3">
      <div className="flex items-center justify-between gap-2">
        <h2 id="plan-heading" className="text-lg">
          Plan
        </h2>
        <Badge tone={badge.tone}>{badge.label}</Badge>
      </div>
      <p className="text-sm text-ink-muted">
        {formatMoney(UNIT_PRICE_MINOR)} per metered site per month
      </p>
      <StandingText data={d} />
    </Card>
  );
}

function SitesCard({ data: d }: { data: LoaderData }) {
  const base = `/o/${d.organization.id}`;
  return (
    <Card aria-labelledby="metered-heading" className="flex flex-col gap-3">
      <h2 id="metered-heading" className="text-lg">
        Metered sites
      </h2>
      <p className="text-4xl font-semibold" data-testid="metered-count">
        {d.meteredSites.length}
      </p>
      {d.meteredSites.length === 0 ? (
        <p className="text-sm text-ink-muted">
          No site has an active meter yet. The plan bills at least one site.
        </p>
      ) : (
        <ul className="flex flex-col gap-1 text-sm">
          {d.meteredSites.map((site) => (
            <li key={site.id} className="flex justify-between gap-2">
              <Link
                to={`${base}/sites/${site.id}`}
                className="font-semibold text-spruce-700 underline-offset-4 hover:underline"
              >
                {site.name}
              </Link>
              <span className="text-ink-muted">
                {site.activeMeters} meter{site.activeMeters === 1 ? "" : "s"}
              </span>
            </li>
          ))}
        </ul>
      )}
      <p className="mt-auto text-sm text-ink-muted">
        A site counts once it has at least one active meter; archived sites and
        removed meters do not.
      </p>
    </Card>
  );
}

function EstimateCard({ data: d }: { data: LoaderData }) {
  const { estimate } = d;
  return (
    <Card aria-labelledby="estimate-heading" className="flex flex-col gap-3">
      <h2 id="estimate-heading" className="text-lg">
        Next invoice
      </h2>
      <p className="text-4xl font-semibold" data-testid="estimate">
        {formatMoney(estimate.amountMinor, estimate.currency)}
      </p>
      <p className="text-sm text-ink-muted">
        {estimate.basis === "stripe"
          ? `Stripe's preview for ${day(estimate.dueOn)}, including any adjustment for sites added or removed during the month.`
          : `${estimate.quantity} site${estimate.quantity === 1 ? "" : "s"} × ${formatMoney(UNIT_PRICE_MINOR)}: what a month costs at today's count.`}
      </p>
      {d.account?.subscribed ? (
        <p className="mt-auto text-sm text-ink-muted">
          Stripe bills {d.account.quantity} site
          {d.account.quantity === 1 ? "" : "s"}; adding or retiring meters
          updates it, with the difference prorated.
        </p>
      ) : null}
    </Card>
  );
}

function Busy({
  intent,
  idle,
  busy,
}: {
  intent: string;
  idle: string;
  busy: string;
}) {
  const navigation = useNavigation();
  const active =
    navigation.state !== "idle" &&
    navigation.formData?.get("intent") === intent;
  return <>{active ? busy : idle}</>;
}

function PaymentCard({
  data: d,
  result,
}: {
  data: LoaderData;
  result?: ActionResult;
}) {
  const subscribed = d.account?.subscribed ?? false;
  const error = result?.intent !== "reconcile" ? result?.error : undefined;
  return (
    <Card aria-labelledby="payment-heading" className="flex flex-col gap-4">
      <div>
        <h2 id="payment-heading" className="text-lg">
          Payment
        </h2>
        <p className="mt-1 text-ink-muted">
          {subscribed
            ? "Change the card, download receipts or cancel on Stripe's billing portal."
            : `Stripe's Checkout takes the card. ${d.estimate.quantity} metered site${d.estimate.quantity === 1 ? "" : "s"} at ${formatMoney(UNIT_PRICE_MINOR)} each: ${formatMoney(d.estimate.quantity * UNIT_PRICE_MINOR)} a month, charged from today.`}
        </p>
      </div>
      {error ? <Notice tone="error">{error}</Notice> : null}
      <Form method="post" className="flex flex-wrap gap-3">
        <input type="hidden" name="attempt" value={d.attempt} />
        {subscribed ? (
          <Button type="submit" name="intent" value="portal">
            <Busy
              intent="portal"
              idle="Manage payment and invoices"
              busy="Opening…"
            />
          </Button>
        ) : (
          <Button
            type="submit"
            name="intent"
            value="subscribe"
            disabled={!d.account}
          >
            <Busy
              intent="subscribe"
              idle="Subscribe with Checkout"
              busy="Opening Checkout…"
            />
          </Button>
        )}
      </Form>
    </Card>
  );
}

function CheckCard({
  data: d,
  result,
}: {
  data: LoaderData;
  result?: ActionResult;
}) {
  const mine = result?.intent === "reconcile" ? result : undefined;
  return (
    <Card aria-labelledby="check-heading" className="flex flex-col gap-3">
      <h2 id="check-heading" className="text-lg">
        Billed sites
      </h2>
      <p className="text-ink-muted">
        Joulebook regularly checks that Stripe bills today&apos;s metered-site
        count, and corrects it if not.{" "}
        {d.account?.lastReconciledAt
          ? `Last checked ${dateTimeUtc(d.account.lastReconciledAt)}.`
          : "Not checked yet."}
      </p>
      {mine?.message ? <Notice tone="success">{mine.message}</Notice> : null}
      {mine?.error ? <Notice tone="error">{mine.error}</Notice> : null}
      <Form method="post">
        <input type="hidden" name="intent" value="reconcile" />
        <Button type="submit" variant="secondary">
          <Busy intent="reconcile" idle="Check now" busy="Checking…" />
        </Button>
      </Form>
    </Card>
  );
}

/** Beside the payment card before a subscription: what subscribing means. */
function TrialNote({ data: d }: { data: LoaderData }) {
  return (
    <Card aria-labelledby="how-heading" className="flex flex-col gap-2">
      <h2 id="how-heading" className="text-lg">
        How billing works
      </h2>
      <ul className="list-disc space-y-1 pl-5 text-ink-muted">
        <li>
          Each month bills the sites with at least one active meter, at{" "}
          {formatMoney(UNIT_PRICE_MINOR)} each (at least one site).
        </li>
        <li>
          Adding or retiring meters changes the count; Stripe prorates the
          difference on the next invoice.
        </li>
        <li>
          If a payment fails, everything keeps working for {d.graceDays} days;
          after that only new sites are refused. Readings and stored data are
          never blocked.
        </li>
      </ul>
    </Card>
  );
}

function InvoicesCard({ invoices }: { invoices: LoaderData["invoices"] }) {
  const rows = invoices.map(invoiceRow);
  return (
    <Card aria-labelledby="invoices-heading">
      <h2 id="invoices-heading" className="text-lg">
        Invoices
      </h2>
      {rows.length === 0 ? (
        <div className="mt-3">
          <EmptyState title="No invoices yet">
            The first invoice arrives when you subscribe.
          </EmptyState>
        </div>
      ) : (
        <div className="mt-3 overflow-x-auto">
          <table className="w-full text-left">
            <thead className="text-sm text-ink-muted">
              <tr>
                <th className="py-1 pr-4 font-semibold">Invoice</th>
                <th className="py-1 pr-4 font-semibold">Issued</th>
                <th className="py-1 pr-4 text-right font-semibold">Amount</th>
                <th className="py-1 pr-4 text-right font-semibold">Paid</th>
                <th className="py-1 pr-4 font-semibold">Status</th>
                <th className="py-1">
                  <span className="sr-only">Link</span>
                </th>
              </tr>
            </thead>
            <tbody className="divide-y divide-line">
              {rows.map((row) => (
                <tr key={row.id} data-invoice={row.id}>
                  <td className="py-2 pr-4 font-semibold">{row.reference}</td>
                  <td className="py-2 pr-4">{row.issued}</td>
                  <td className="py-2 pr-4 text-right">{row.amount}</td>
                  <td className="py-2 pr-4 text-right">{row.paid}</td>
                  <td className="whitespace-nowrap py-2 pr-4">
                    <Badge tone={row.status.tone}>{row.status.label}</Badge>
                  </td>
                  <td className="py-2 text-right">
                    {row.link ? (
                      <a
                        href={row.link}
                        className="font-semibold text-spruce-700 underline-offset-4 hover:underline"
                        rel="noreferrer"
                        target="_blank"
                      >
                        View
                      </a>
                    ) : null}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
          {anyBeingPrepared(invoices) ? (
            <p className="mt-2 text-sm text-ink-muted">
              Stripe is preparing an invoice: its number, and the payment, show
              here within a minute. Reload the page to see them.
            </p>
          ) : null}
        </div>
      )}
    </Card>
  );
}

function CheckoutReturn({ data: d }: { data: LoaderData }) {
  if (d.checkout === "cancelled")
    return <Notice>Checkout was cancelled; nothing was charged.</Notice>;
  if (d.checkout !== "done") return null;
  return d.account?.subscribed ? (
    <Notice tone="success" title="Subscribed">
      Thank you: the paid plan has started.
    </Notice>
  ) : (
    <Notice title="Checkout finished">
      Stripe is confirming the payment; reload this page in a moment to see the
      plan.
    </Notice>
  );
}

export default function Billing({
  loaderData,
  actionData,
}: Route.ComponentProps) {
  const result = actionData as ActionResult | undefined;
  return (
    <>
      <PageHeader
        title="Billing"
        description={`What ${loaderData.organization.name} pays for Joulebook: ${formatMoney(UNIT_PRICE_MINOR)} per metered site per month, through Stripe.`}
      />
      <div className="flex flex-col gap-6">
        <CheckoutReturn data={loaderData} />
        {loaderData.serviceProblem ? (
          <Notice tone="error">{loaderData.serviceProblem}</Notice>
        ) : null}
        <div className="grid gap-6 lg:grid-cols-3">
          <PlanCard data={loaderData} />
          <SitesCard data={loaderData} />
          <EstimateCard data={loaderData} />
        </div>
        {loaderData.canManage ? (
          <div className="grid gap-6 lg:grid-cols-2">
            <PaymentCard data={loaderData} result={result} />
            {/* Only a subscription has a quantity to check. */}
            {loaderData.account?.stripeSubscriptionId ? (
              <CheckCard data={loaderData} result={result} />
            ) : (
              <TrialNote data={loaderData} />
            )}
          </div>
        ) : null}
        <InvoicesCard invoices={loaderData.invoices} />
      </div>
    </>
  );
}
