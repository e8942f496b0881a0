import { createHash } from "node:crypto";

const names = new Map<string, string>();

/**
 * A statement PostgreSQL prepares once per connection: the ingest statements
 * run for every batch, and parsing and planning them again each time is a
 * measurable share of a batch. The name is derived from the text, so two
 * texts can never share one (node-postgres refuses that).
 */
export function named(text: string): { name: string; text: string } {
  let name = names.get(text);
  if (!name) {
    name = `ingest_${createHash("sha1").update(text).digest("hex").slice(0, 20)}`;
    names.set(text, name);
  }
  return { name, text };
}
