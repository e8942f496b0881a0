import { data, redirect } from "react-router";
import { notFound } from "~/auth/membership.server";
import { requirePermission } from "~/auth/page-access.server";
import { can, roleLabels } from "~/auth/permissions";
import { ListCard } from "~/components/list-card";
import { InvitationsCard } from "~/components/members/invitations-card";
import { InviteForm } from "~/components/members/invite-form";
import { MemberRow } from "~/components/members/member-row";
import { Notice, PageHeader } from "~/components/ui";
import { EmailDeliveryError } from "~/email/mailer.server";
import { parseForm, type FieldErrors } from "~/lib/forms";
import {
  changeRoleSchema,
  inviteSchema,
  removeSchema,
  revokeSchema,
  type MembersActionResult as ActionResult,
} from "~/organizations/member-forms";
import {
  MembershipRuleError,
  changeMemberRole,
  inviteMember,
  listMembers,
  listPendingInvitations,
  removeMember,
  revokeInvitation,
} from "~/organizations/members.server";
import type { Route } from "./+types/members";

export const meta: Route.MetaFunction = () => [
  { title: "Members · Joulebook" },
];

export async function loader({ context }: Route.LoaderArgs) {
  const { organization, role, user } = requirePermission(
    context,
    "members.view",
  );
  const manage = can(role, "members.manage");
  const [members, invitations] = await Promise.all([
    listMembers({ organizationId: organization.id }),
    manage
      ? listPendingInvitations({ organizationId: organization.id })
      : Promise.resolve([]),
  ]);
  return { organization, manage, members, invitations, currentUserId: user.id };
}

function failure(
  intent: string,
  errors: FieldErrors,
  status = 400,
  subject?: string,
) {
  return data<ActionResult>({ intent, errors, subject }, { status });
}

function success(intent: string, message: string) {
  return data<ActionResult>({ intent, errors: {}, message });
}

export async function action({ request, context }: Route.ActionArgs) {
  const { organization, user } = requirePermission(context, "members.manage");
  const formData = await request.formData();
  const intent = String(formData.get("intent") ?? "");
  const scope = { organizationId: organization.id, actorUserId: user.id };
  try {
    switch (intent) {
      case "invite": {
        const form = parseForm(formData, inviteSchema);
        if (!form.ok) return failure(intent, form.errors);
        const outcome = await inviteMember({
          organizationId: organization.id,
          organizationName: organization.name,
          actor: { id: user.id, name: user.name },
          email: form.data.email,
          role: form.data.role,
        });
        if (outcome === "already_member") {
          return failure(
            intent,
            { email: "This person is already a member." },
            409,
          );
        }
        return success(intent, `Invitation sent to ${form.data.email}.`);
      }
      case "change-role": {
        const form = parseForm(formData, changeRoleSchema);
        if (!form.ok) return failure(intent, form.errors);
        const changed = await changeMemberRole({
          ...scope,
          userId: form.data.userId,
          role: form.data.role,
        });
        if (!changed) notFound("No such member.");
        return success(
          intent,
          `Role changed to ${roleLabels[form.data.role]}.`,
        );
      }
      case "remove": {
        const form = parseForm(formData, removeSchema);
        if (!form.ok) return failure(intent, form.errors);
        const removed = await removeMember({
          ...scope,
          userId: form.data.userId,
        });
        if (!removed) notFound("No such member.");
        if (form.data.userId === user.id) throw redirect("/");
        return success(intent, "Member removed.");
      }
      case "revoke": {
        const form = parseForm(formData, revokeSchema);
        if (!form.ok) return failure(intent, form.errors);
        const revoked = await revokeInvitation({
          ...scope,
          invitationId: form.data.invitationId,
        });
        if (!revoked) notFound("No such invitation.");
        return success(intent, "Invitation withdrawn.");
      }
      default:
        return failure(intent, { form: "Unknown action." });
    }
  } catch (error) {
    if (error instanceof MembershipRuleError) {
      return failure(
        intent,
        { form: error.message },
        409,
        String(formData.get("userId") ?? ""),
      );
    }
    if (error instanceof EmailDeliveryError) {
      return failure(
        intent,
        { form: `${error.message} The invitation was not created.` },
        502,
      );
    }
    throw error;
  }
}

export default function Members({
  loaderData,
  actionData,
}: Route.ComponentProps) {
  const { members, invitations, manage, currentUserId, organization } =
    loaderData;
  const result = actionData as ActionResult | undefined;
  const ruleError =
    result && result.intent !== "invite" ? result.errors.form : undefined;
  return (
    <>
      <PageHeader
        title="Members"
        description={`People with access to ${organization.name}, and what each may do.`}
      />
      <div className="flex flex-col gap-6">
        {result?.message ? (
          <Notice tone="success">{result.message}</Notice>
        ) : null}
        {ruleError ? <Notice tone="error">{ruleError}</Notice> : null}
        {manage ? <InviteForm result={result} /> : null}
        <ListCard
          headingId="members-heading"
          title={`${members.length} member${members.length === 1 ? "" : "s"}`}
          empty={null}
        >
          {members.map((m) => (
            <MemberRow
              // Keyed by the stored role too: after a saved change the row
              // starts afresh, so its menu's default is the new role.
              key={`${m.userId}:${m.role}`}
              member={m}
              manage={manage}
              isSelf={m.userId === currentUserId}
              refusal={
                result?.intent === "change-role" && result.subject === m.userId
                  ? result
                  : undefined
              }
            />
          ))}
        </ListCard>
        {manage ? <InvitationsCard invitations={invitations} /> : null}
      </div>
    </>
  );
}
