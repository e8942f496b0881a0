/**
 * /v1 routes for the catalogue and records: customers, products, prices,
 * invoice items and events.
 */
import { Router } from "express";
import { listOf, mustFind, type Ctx } from "./context";
import { invalid, parse } from "./errors";
import { input, reply, retrieveRoute } from "./http";
import { newCustomer, newPrice, newProduct } from "./objects";
import * as P from "./params";
import { mergeMetadata, type Metadata } from "./store";

const meta = (m: Metadata | "" | undefined): Metadata => mergeMetadata({}, m);

export function catalogRoutes(ctx: Ctx): Router {
  const r = Router();
  const { state } = ctx;

  r.post("/v1/customers", (req, res) => {
    const p = parse(P.customerCreate, input(req));
    const customer = newCustomer(ctx, { ...p, metadata: meta(p.metadata) });
    state.customers.push(customer);
    ctx.emit("customer.created", customer);
    reply(ctx, res, customer, p.expand);
  });
  r.get("/v1/customers", (req, res) => {
    const p = parse(P.customerList, input(req));
    const found = state.customers.filter(
      (c) => !p.email || c.email === p.email,
    );
    reply(ctx, res, listOf(found, "/v1/customers", p), p.expand);
  });
  retrieveRoute(r, ctx, "/v1/customers", (id) =>
    mustFind(state.customers, id, "customer"),
  );
  r.post("/v1/customers/:id", (req, res) => {
    const p = parse(P.customerCreate, input(req));
    const customer = mustFind(state.customers, req.params.id, "customer");
    if (p.email !== undefined) customer.email = p.email || null;
    if (p.name !== undefined) customer.name = p.name || null;
    if (p.description !== undefined)
      customer.description = p.description || null;
    customer.metadata = mergeMetadata(customer.metadata, p.metadata);
    ctx.emit("customer.updated", customer);
    reply(ctx, res, customer, p.expand);
  });

  r.post("/v1/products", (req, res) => {
    const p = parse(P.productCreate, input(req));
    const product = newProduct(ctx, { ...p, metadata: meta(p.metadata) });
    state.products.push(product);
    reply(ctx, res, product, p.expand);
  });
  retrieveRoute(r, ctx, "/v1/products", (id) =>
    mustFind(state.products, id, "product"),
  );

  r.post("/v1/prices", (req, res) => {
    const p = parse(P.priceCreate, input(req));
    const product = priceProduct(ctx, p.product, p.product_data);
    claimLookupKey(ctx, p.lookup_key, p.transfer_lookup_key);
    const price = newPrice(ctx, { ...p, product, metadata: meta(p.metadata) });
    state.prices.push(price);
    reply(ctx, res, price, p.expand);
  });
  r.get("/v1/prices", (req, res) => {
    const p = parse(P.priceList, input(req));
    const found = state.prices.filter(
      (price) =>
        (!p.lookup_keys || p.lookup_keys.includes(price.lookup_key ?? "")) &&
        (p.active === undefined || price.active === p.active) &&
        (!p.product || price.product === p.product),
    );
    reply(ctx, res, listOf(found, "/v1/prices", p), p.expand);
  });
  retrieveRoute(r, ctx, "/v1/prices", (id) =>
    mustFind(state.prices, id, "price"),
  );

  r.get("/v1/invoiceitems", (req, res) => {
    const p = parse(P.invoiceItemList, input(req));
    const found = state.invoiceItems.filter(
      (ii) =>
        (!p.customer || ii.customer === p.customer) &&
        (!p.invoice || ii.invoice === p.invoice) &&
        (p.pending === undefined || (ii.invoice === null) === p.pending),
    );
    reply(ctx, res, listOf(found, "/v1/invoiceitems", p), p.expand);
  });
  retrieveRoute(r, ctx, "/v1/invoiceitems", (id) =>
    mustFind(state.invoiceItems, id, "invoiceitem"),
  );

  r.get("/v1/events", (req, res) => {
    const p = parse(P.eventList, input(req));
    const found = state.events.filter((e) => !p.type || e.type === p.type);
    reply(ctx, res, listOf(found, "/v1/events", p), p.expand);
  });
  retrieveRoute(r, ctx, "/v1/events", (id) =>
    mustFind(state.events, id, "event"),
  );
  return r;
}

/** A price names an existing product or creates one from product_data. */
function priceProduct(
  ctx: Ctx,
  productId: string | undefined,
  productData: { name: string; metadata?: Metadata | "" } | undefined,
): string {
  if (productId && productData)
    throw invalid("product", "Pass either product or product_data, not both.");
  if (productId)
    return mustFind(ctx.state.products, productId, "product", "product").id;
  if (!productData)
    throw invalid("product", "Missing required param: product.");
  const product = newProduct(ctx, {
    name: productData.name,
    metadata: meta(productData.metadata),
  });
  ctx.state.products.push(product);
  return product.id;
}

/** Lookup keys are unique; transfer_lookup_key moves one to the new price. */
function claimLookupKey(
  ctx: Ctx,
  key: string | undefined,
  transfer?: boolean,
): void {
  if (!key) return;
  const holder = ctx.state.prices.find((p) => p.lookup_key === key);
  if (!holder) return;
  if (!transfer)
    throw invalid(
      "lookup_key",
      `A price (\`${holder.id}\`) already uses that lookup key. Pass transfer_lookup_key=true to move it.`,
    );
  holder.lookup_key = null;
}
