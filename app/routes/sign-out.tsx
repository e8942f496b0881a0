import { redirect } from "react-router";
import { endSession } from "~/auth/session.server";
import type { Route } from "./+types/sign-out";

export async function action({ request }: Route.ActionArgs) {
  throw redirect("/sign-in", {
    headers: { "Set-Cookie": await endSession(request) },
  });
}

// Signing out changes state, so it only happens by POST; a visit goes home.
export function loader() {
  throw redirect("/");
}
