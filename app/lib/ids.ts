/**
 * Ids are PostgreSQL uuids. A string of another shape would make the query
 * fail (a 500), so ids from URLs and forms are checked here first: a
 * malformed id in a URL is a page that does not exist (404), in a form field
 * an error beside the field (400).
 */
import { z } from "zod";

/**
 * The canonical text form PostgreSQL's uuid type accepts, any version, as
 * regex text (for SQL's `~*` as well) and as an anchored pattern.
 */
export const UUID_TEXT =
  "[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}";
const UUID = new RegExp(`^${UUID_TEXT}$`, "i");

export function isUuid(value: unknown): value is string {
  return typeof value === "string" && UUID.test(value);
}

/**
 * An id in the JSON API (path, query, answer). zod's guid is this same
 * any-version 8-4-4-4-12 form, and the OpenAPI document reads it as a uuid.
 */
export function idSchema(message?: string) {
  return z.guid(message);
}

/** A form field holding one id, e.g. a meter chosen from a list. */
export function idField(message: string) {
  return z.string().trim().regex(UUID, message);
}

/** The same, where an empty choice ("none") is allowed. */
export function optionalIdField(message: string) {
  return z.union([z.literal(""), idField(message)], { error: message });
}
