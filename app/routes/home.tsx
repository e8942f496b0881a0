import { redirect } from "react-router";
import { listMemberships } from "~/auth/membership.server";
import { getUser } from "~/auth/session.server";
import type { Route } from "./+types/home";

/** The front door: into the first organisation, or to sign-in. */
export async function loader({ request }: Route.LoaderArgs) {
  const user = await getUser(request);
  if (!user) throw redirect("/sign-in");
  const [first] = await listMemberships(user.id);
  throw redirect(first ? `/o/${first.id}` : "/account");
}
