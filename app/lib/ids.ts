/**
 * Ids are PostgreSQL uuids. A string of another shape would make the query
 * fail (a 500), so ids from URLs and forms are checked here first: a
 * malformed id in a URL is a page that does not exist (404), in a form field
 * an error beside the field (400).
 */
import { z } from "zod";

/** The canonical text form PostgreSQL's uuid type accepts, any version. */
const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

export function isUuid(value: unknown): value is string {
  return typeof value === "string" && UUID.test(value);
}

/** A form field holding one id, e.g. a meter chosen from a list. */
export function idField(message: string) {
  return z.string().trim().regex(UUID, message);
}

/** The same, where an empty choice ("none") is allowed. */
export function optionalIdField(message: string) {
  return z.union([z.literal(""), idField(message)], { error: message });
}
