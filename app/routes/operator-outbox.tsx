import { data, redirect } from "react-router";
import { OutboxMessages } from "~/components/outbox-messages";
import { PageHeader, Wordmark } from "~/components/ui";
import {
  hasOperatorCookie,
  isOperatorKey,
  operatorKeyCookie,
} from "~/email/outbox-operator.server";
import { loadOutbox } from "~/email/outbox.server";
import type { Route } from "./+types/operator-outbox";

export const meta: Route.MetaFunction = () => [
  { title: "All mail (operator) · Joulebook" },
];

/**
 * Development only: every message the local e-mail fake caught, for the
 * operator of the machine, who holds the key `npm start` prints. Opening
 * `?key=…` trades the key for a cookie limited to this page.
 */
export async function loader({ request }: Route.LoaderArgs) {
  const key = new URL(request.url).searchParams.get("key");
  if (key !== null) {
    if (!isOperatorKey(key)) throw refused();
    throw redirect("/operator/outbox", {
      headers: { "Set-Cookie": await operatorKeyCookie(key) },
    });
  }
  if (!(await hasOperatorCookie(request))) throw refused();
  return loadOutbox(request, "operator");
}

function refused() {
  return data(
    {
      message:
        "This page is for the operator of the machine: open the link npm start printed.",
    },
    { status: 403 },
  );
}

export default function OperatorOutbox({ loaderData }: Route.ComponentProps) {
  return (
    <main className="mx-auto max-w-6xl px-5 py-8">
      <Wordmark />
      <div className="mt-6">
        <PageHeader
          title="All mail on this machine"
          description="Every e-mail Joulebook sent, caught by the local e-mail service, for the machine's operator: reset links and invitations for people who cannot sign in yet are here. Nothing leaves this machine."
        />
        <OutboxMessages
          {...loaderData}
          empty="Every message Joulebook sends on this machine will appear here."
        />
      </div>
    </main>
  );
}
