import { signedInPrincipal } from "~/auth/page-access.server";
import { OutboxMessages } from "~/components/outbox-messages";
import { PageHeader } from "~/components/ui";
import { loadOutbox } from "~/email/outbox.server";
import type { Route } from "./+types/outbox";

export const meta: Route.MetaFunction = () => [{ title: "Outbox · Joulebook" }];

/**
 * Development only: the signed-in person's mail as the local e-mail fake
 * caught it, and, for owners, the invitations their organisations sent
 * (app/email/outbox-visibility.ts). Mail for people who cannot sign in yet
 * is for the machine's operator (routes/operator-outbox.tsx).
 */
export async function loader({ request, context }: Route.LoaderArgs) {
  const principal = signedInPrincipal(context);
  const { user } = principal;
  const memberships = await principal.memberships();
  const ownerOf = new Set(
    memberships.filter((m) => m.role === "owner").map((m) => m.id),
  );
  return {
    email: user.email,
    ...(await loadOutbox(request, { email: user.email, ownerOf })),
  };
}

export default function Outbox({ loaderData }: Route.ComponentProps) {
  return (
    <>
      <PageHeader
        title="Outbox"
        description={`E-mail to ${loaderData.email}, caught by the local e-mail service. Nothing leaves this machine.`}
      />
      <OutboxMessages
        {...loaderData}
        empty="Messages sent to you, and the invitations sent by organisations you own, appear here. Reset links for people who cannot sign in are for the machine's operator, through the link npm start prints."
      />
    </>
  );
}
