import type { ReactNode } from "react";
import { Link } from "react-router";
import { RelativeTime } from "./relative-time";
import { Card, EmptyState, Notice, cx } from "./ui";

export interface OutboxItem {
  id: string;
  created_at: string;
  from: string;
  to: string[];
  subject: string;
  text: string | null;
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

function MessageList({
  messages,
  selectedId,
  now,
}: {
  messages: OutboxItem[];
  selectedId: string | undefined;
  now: string;
}) {
  return (
    <Card className="p-2 sm:p-2">
      <ul aria-label="Messages">
        {messages.map((m) => (
          <li key={m.id}>
            <Link
              to={`?id=${m.id}`}
              aria-current={m.id === selectedId ? "true" : undefined}
              className={cx(
                "block rounded-lg px-3 py-2 hover:bg-sunken",
                m.id === selectedId && "bg-spruce-50",
              )}
            >
              <span className="block font-semibold">{m.subject}</span>
              <span className="block text-sm text-ink-muted">
                to {m.to.join(", ")} ·{" "}
                <RelativeTime at={m.created_at} now={now} />
              </span>
            </Link>
          </li>
        ))}
      </ul>
    </Card>
  );
}

/** The messages of the local e-mail fake a viewer may read, and one opened. */
export function OutboxMessages({
  messages,
  selected,
  unavailable,
  empty,
  now,
}: {
  messages: OutboxItem[];
  selected: OutboxItem | null;
  unavailable: boolean;
  empty: ReactNode;
  /** The loader's time, from which "… ago" is measured. */
  now: string;
}) {
  if (unavailable)
    return (
      <Notice tone="error">
        The local e-mail service is not answering. Restart with npm start.
      </Notice>
    );
  if (messages.length === 0)
    return <EmptyState title="No e-mail yet">{empty}</EmptyState>;
  return (
    <div className="grid gap-5 lg:grid-cols-[minmax(0,2fr)_minmax(0,3fr)]">
      <MessageList messages={messages} selectedId={selected?.id} now={now} />
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
  );
}
