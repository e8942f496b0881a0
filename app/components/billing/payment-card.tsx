import { Form } from "react-router";
import type { BillingActionResult } from "~/billing/billing-words";
import type { BillingOverview } from "~/billing/overview.server";
import { formatMoney, UNIT_PRICE_MINOR } from "~/billing/plan";
import { Button, Card, Notice } from "~/components/ui";
import { BusyLabel } from "./busy-label";

/** To Stripe: Checkout before a subscription, the billing portal after. */
export function PaymentCard({
  account,
  estimate,
  attempt,
  result,
}: {
  account: BillingOverview["account"];
  estimate: BillingOverview["estimate"];
  /** This rendering's attempt: posting it again reuses its Stripe session. */
  attempt: string;
  result?: BillingActionResult;
}) {
  const subscribed = account?.subscribed ?? false;
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
            : `Stripe's Checkout takes the card. ${estimate.quantity} metered site${estimate.quantity === 1 ? "" : "s"} at ${formatMoney(UNIT_PRICE_MINOR)} each: ${formatMoney(estimate.quantity * UNIT_PRICE_MINOR)} a month, charged from today.`}
        </p>
      </div>
      {error ? <Notice tone="error">{error}</Notice> : null}
      <Form method="post" className="flex flex-wrap gap-3">
        <input type="hidden" name="attempt" value={attempt} />
        {subscribed ? (
          <Button type="submit" name="intent" value="portal">
            <BusyLabel
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
            disabled={!account}
          >
            <BusyLabel
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
