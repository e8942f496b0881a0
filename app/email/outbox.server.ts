import { data } from "react-router";
import { outboxEnabled } from "~/env.server";
import { listOutbox } from "./mailer.server";
import { visibleTo, type OutboxViewer } from "./outbox-visibility";

/**
 * What an Outbox page shows: the viewer's part of the local fake's mail and
 * the message opened by `?id=`. 404 when mail goes to a real service.
 */
export async function loadOutbox(
  request: Request,
  viewer: OutboxViewer | "operator",
) {
  if (!outboxEnabled())
    throw data(
      { message: "The Outbox exists only in development." },
      { status: 404 },
    );
  // "… ago" is measured from this, so server and browser say the same.
  const now = new Date().toISOString();
  const all = await listOutbox().catch(() => null);
  if (!all) return { messages: [], selected: null, unavailable: true, now };
  const messages = visibleTo(all, viewer);
  const id = new URL(request.url).searchParams.get("id");
  const selected = messages.find((m) => m.id === id) ?? messages[0] ?? null;
  return { messages, selected, unavailable: false, now };
}
