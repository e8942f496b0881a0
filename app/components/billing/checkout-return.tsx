import { Notice } from "~/components/ui";

/** Back from Stripe's Checkout: cancelled, subscribed, or still confirming. */
export function CheckoutReturn({
  checkout,
  subscribed,
}: {
  /** The `checkout` the loader read from the URL: "done", "cancelled" or null. */
  checkout: string | null;
  subscribed: boolean;
}) {
  if (checkout === "cancelled")
    return <Notice>Checkout was cancelled; nothing was charged.</Notice>;
  if (checkout !== "done") return null;
  return subscribed ? (
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
