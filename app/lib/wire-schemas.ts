/**
 * Building blocks of the JSON wire shapes, shared by the API's schemas
 * (app/api/schemas.ts) and the shapes that live beside their domain
 * (app/ledger/ledger-schema.ts, app/ingest/interval-schema.ts, …). A plain
 * module: pages infer their types from the same schemas.
 */
import { z } from "zod";
import { carriers } from "~/sites/meter-kinds";
import { idSchema } from "./ids";

/** Any 8-4-4-4-12 hex id, the form PostgreSQL's uuid type takes (`isUuid`). */
export const id = idSchema;

/** Exact PostgreSQL numerics travel as decimal text, never as doubles. */
export const decimalKwh = (description: string) =>
  z
    .string()
    .regex(/^-?\d+(\.\d+)?$/)
    .describe(`${description}, kWh as exact decimal text`);

/** Carbon as exact decimal text (kWh × kg/kWh keeps every digit). */
export const decimalKg = (description: string) =>
  z
    .string()
    .regex(/^-?\d+(\.\d+)?$/)
    .describe(`${description}, kg CO₂e as exact decimal text`);

export const carrier = z.enum(carriers);
