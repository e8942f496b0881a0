import { formatDistanceToNowStrict } from "date-fns";
import { data, Link } from "react-router";
import { requireUser } from "~/auth/session.server";
import { Card, EmptyState, Notice, PageHeader, cx } from "~/components/ui";
import { outboxEnabled } from "~/env.server";
import { listOutbox } from "~/email/mailer.server";
import type { Route } from "./+types/outbox";

export const meta: Route.MetaFunction = () => [{ title: "Outbox · Joulebook" }];

/**
 * Development only: the messages the local e-mail fake received, so links in
 * invitations and reset e-mails can be followed without a mail server. It
 * shows every message (a new invitee has no account to sign in with yet), so
 * it exists only while mail goes to the local fake, never with a real key.
 */
export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireUser(request);
  if (!outboxEnabled())
    throw data(
      { message: "The Outbox exists only in development." },
      { status: 404 },
    );
  const all = await listOutbox().catch(() => null);
  if (!all)
    return {
      messages: [],
      selected: null,
      unavailable: true,
      email: user.email,
    };
  const messages = all;
  const id = new URL(request.url).searchParams.get("id");
  const selected = messages.find((m) => m.id === id) ?? messages[0] ?? null;
  return { messages, selected, unavailable: false, email: user.email };
}

/** Plain text with its links made clickable. */
function LinkedText({ text }: { text: string }) {
  const parts = text.split(/(https?:\/\/\S+)/g);
  return (
    <p className="whitespace-pre-wrap">
      {parts.map((part, i) =>
        /^https?:\/\//.test(part) ? (
          <a
            key={i}
            href={part}
            className="break-all font-semibold text-spruce-700 underline"
          >
            {part}
          </a>
        ) : (
          <span key={i}>{part}</span>
        ),
      )}
    </p>
  );
}

export default function Outbox({ loaderData }: Route.ComponentProps) {
  const { messages, selected, unavailable, email } = loaderData;
  return (
    <>
      <PageHeader
        title="Outbox"
        description={`Every e-mail Joulebook sent, caught by the local e-mail service (you are ${email}). Nothing leaves this machine.`}
      />
      {unavailable ? (
        <Notice tone="error">
          The local e-mail service is not answering. Restart with npm start.
        </Notice>
      ) : messages.length === 0 ? (
        <EmptyState title="No e-mail yet">
          Invitations and password-reset links sent to you will appear here.
        </EmptyState>
      ) : (
        <div className="grid gap-5 lg:grid-cols-[minmax(0,2fr)_minmax(0,3fr)]">
          <Card className="p-2 sm:p-2">
            <ul aria-label="Messages">
              {messages.map((m) => (
                <li key={m.id}>
                  <Link
                    to={`?id=${m.id}`}
                    aria-current={m.id === selected?.id ? "true" : undefined}
                    className={cx(
                      "block rounded-lg px-3 py-2 hover:bg-sunken",
                      m.id === selected?.id && "bg-spruce-50",
                    )}
                  >
                    <span className="block font-semibold">{m.subject}</span>
                    <span className="block text-sm text-ink-muted">
                      to {m.to.join(", ")} ·{" "}
                      {formatDistanceToNowStrict(new Date(m.created_at))} ago
                    </span>
                  </Link>
                </li>
              ))}
            </ul>
          </Card>
          {selected ? (
            <Card aria-labelledby="message-heading">
              <h2 id="message-heading" className="text-lg">
                {selected.subject}
              </h2>
              <p className="text-sm text-ink-muted">
                From {selected.from} · to {selected.to.join(", ")}
              </p>
              <div className="mt-4 border-t border-line pt-4">
                <LinkedText text={selected.text ?? "(HTML only)"} />
              </div>
            </Card>
          ) : null}
        </div>
      )}
    </>
  );
}
