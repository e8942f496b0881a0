/**
 * Who may read which message in the development Outbox. The local e-mail
 * fake holds everyone's mail in one place, so the page must not show it all:
 * a reset link read by anyone but its addressee hands over the account.
 *
 * - A signed-in person sees the messages addressed to them.
 * - An owner also sees the invitations their organisation sent, so a new
 *   colleague can be let in on a machine without a mail server.
 * - The operator of the machine (who holds the key `npm start` prints) sees
 *   everything, including mail for people who cannot sign in yet.
 */
export interface OutboxViewer {
  email: string;
  /** Organisations in which the viewer is an owner. */
  ownerOf: ReadonlySet<string>;
}

export interface TaggedMessage {
  to: string[];
  tags: { name: string; value: string }[];
}

function tag(message: TaggedMessage, name: string): string | undefined {
  return message.tags.find((t) => t.name === name)?.value;
}

export function visibleTo<M extends TaggedMessage>(
  messages: M[],
  viewer: OutboxViewer | "operator",
): M[] {
  if (viewer === "operator") return messages;
  const me = viewer.email.toLowerCase();
  return messages.filter((m) => {
    if (m.to.some((address) => address.toLowerCase() === me)) return true;
    const organization = tag(m, "organization");
    return (
      tag(m, "kind") === "invitation" &&
      organization !== undefined &&
      viewer.ownerOf.has(organization)
    );
  });
}
