/**
 * Request parameters of each endpoint. The SDK form-encodes everything, so
 * numbers and booleans arrive as strings and are converted here; strict
 * objects turn any parameter the fake does not implement into a 400 that
 * names it.
 */
import { z } from "zod";

const text = z.string().max(5000);
const integer = z
  .string()
  .regex(/^-?\d+$/, "expected an integer")
  .transform(Number);
const count = integer.pipe(z.number().int().min(0).max(10_000));
const positive = integer.pipe(z.number().int().min(1).max(10_000));
const bool = z
  .enum(["true", "false"], { error: "expected true or false" })
  .transform((v) => v === "true");
const metadata = z
  .union([z.literal(""), z.record(z.string().max(40), z.string().max(500))])
  .optional();
const expand = z.array(text).max(20).optional();
const prorationBehavior = z
  .enum(["create_prorations", "none", "always_invoice"])
  .optional();

const list = {
  limit: integer.pipe(z.number().int().min(1).max(100)).optional(),
  starting_after: text.optional(),
  ending_before: text.optional(),
  expand,
};

export const customerCreate = z.strictObject({
  email: text.optional(),
  name: text.optional(),
  description: text.optional(),
  metadata,
  expand,
});
export const customerList = z.strictObject({ email: text.optional(), ...list });

export const productCreate = z.strictObject({
  name: text.min(1),
  description: text.optional(),
  active: bool.optional(),
  metadata,
  expand,
});

export const priceCreate = z.strictObject({
  currency: z
    .string()
    .regex(/^[a-zA-Z]{3}$/, "expected a three-letter ISO currency code")
    .transform((c) => c.toLowerCase()),
  unit_amount: count,
  recurring: z
    .strictObject({
      interval: z.enum(["day", "week", "month", "year"]),
      interval_count: positive.optional(),
    })
    .optional(),
  product: text.optional(),
  product_data: z.strictObject({ name: text.min(1), metadata }).optional(),
  lookup_key: text.max(200).optional(),
  transfer_lookup_key: bool.optional(),
  nickname: text.optional(),
  active: bool.optional(),
  metadata,
  expand,
});
export const priceList = z.strictObject({
  lookup_keys: z.array(text).max(10).optional(),
  active: bool.optional(),
  product: text.optional(),
  ...list,
});

// One item per subscription is all Joulebook uses (metered sites × price).
const oneItem = "the local Stripe fake supports exactly one subscription item";

export const subscriptionCreate = z.strictObject({
  customer: text,
  items: z
    .array(z.strictObject({ price: text, quantity: positive.optional() }))
    .min(1)
    .max(1, oneItem),
  trial_period_days: count.pipe(z.number().max(730)).optional(),
  proration_behavior: prorationBehavior,
  metadata,
  expand,
});

export const subscriptionUpdate = z.strictObject({
  items: z
    .array(z.strictObject({ id: text, quantity: positive.optional() }))
    .max(1, oneItem)
    .optional(),
  proration_behavior: prorationBehavior,
  proration_date: integer.optional(),
  cancel_at_period_end: bool.optional(),
  metadata,
  expand,
});

export const subscriptionList = z.strictObject({
  customer: text.optional(),
  price: text.optional(),
  status: z
    .enum([
      "all",
      "active",
      "trialing",
      "past_due",
      "canceled",
      "incomplete",
      "ended",
    ])
    .optional(),
  ...list,
});

export const subscriptionItemUpdate = z.strictObject({
  quantity: positive.optional(),
  proration_behavior: prorationBehavior,
  proration_date: integer.optional(),
  metadata,
  expand,
});

export const onlyExpand = z.strictObject({ expand });

export const invoiceList = z.strictObject({
  customer: text.optional(),
  subscription: text.optional(),
  status: z.enum(["draft", "open", "paid", "void"]).optional(),
  ...list,
});

export const invoicePreview = z.strictObject({
  customer: text.optional(),
  subscription: text.optional(),
  subscription_details: z
    .strictObject({
      items: z
        .array(z.strictObject({ id: text, quantity: positive.optional() }))
        .max(1, oneItem)
        .optional(),
      proration_behavior: prorationBehavior,
      proration_date: integer.optional(),
    })
    .optional(),
  expand,
});

export const invoiceItemList = z.strictObject({
  customer: text.optional(),
  invoice: text.optional(),
  pending: bool.optional(),
  ...list,
});

export const checkoutCreate = z.strictObject({
  mode: text,
  customer: text.optional(),
  customer_email: text.optional(),
  line_items: z
    .array(z.strictObject({ price: text, quantity: positive.optional() }))
    .min(1)
    .max(1, oneItem),
  success_url: z.url(),
  cancel_url: z.url().optional(),
  client_reference_id: text.max(200).optional(),
  metadata,
  subscription_data: z
    .strictObject({
      metadata,
      trial_period_days: count.pipe(z.number().min(1).max(730)).optional(),
    })
    .optional(),
  expand,
});

export const portalCreate = z.strictObject({
  customer: text,
  return_url: z.url().optional(),
  expand,
});

export const eventList = z.strictObject({ type: text.optional(), ...list });

export type ProrationBehavior = NonNullable<
  z.infer<typeof subscriptionUpdate>["proration_behavior"]
>;
