import { useEffect, useRef } from "react";
import { data, Form, redirect, useNavigation } from "react-router";
import { z } from "zod";
import { notFound } from "~/auth/membership.server";
import { requirePermission } from "~/auth/page-access.server";
import {
  can,
  roleDescriptions,
  roleLabels,
  roles,
  type Role,
} from "~/auth/permissions";
import {
  Badge,
  Button,
  Card,
  EmptyState,
  Field,
  Notice,
  PageHeader,
  SelectField,
} from "~/components/ui";
import { EmailDeliveryError } from "~/email/mailer.server";
import { INVITATION_DAYS } from "~/auth/policy";
import { emailField, parseForm, type FieldErrors } from "~/lib/forms";
import { dateTimeUtc, dayUtc } from "~/lib/times";
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

const roleField = z.enum(roles, { error: "Choose one of the four roles." });
const idField = z.string().min(1).max(64);

const inviteSchema = z.strictObject({
  intent: z.literal("invite"),
  email: emailField,
  role: roleField,
});
const changeRoleSchema = z.strictObject({
  intent: z.literal("change-role"),
  userId: idField,
  role: roleField,
});
const removeSchema = z.strictObject({
  intent: z.literal("remove"),
  userId: idField,
});
const revokeSchema = z.strictObject({
  intent: z.literal("revoke"),
  invitationId: z.uuid("Unknown invitation."),
});

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

type ActionResult = {
  intent: string;
  errors: FieldErrors;
  message?: string;
  subject?: string;
};

function failure(
  intent: string,
  errors: FieldErrors,
  status = 400,
  subject?: string,
) {
  return data<ActionResult>({ intent, errors, subject }, { status });
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
        return data<ActionResult>({
          intent,
          errors: {},
          message: `Invitation sent to ${form.data.email}.`,
        });
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
        return data<ActionResult>({
          intent,
          errors: {},
          message: `Role changed to ${roleLabels[form.data.role]}.`,
        });
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
        return data<ActionResult>({
          intent,
          errors: {},
          message: "Member removed.",
        });
      }
      case "revoke": {
        const form = parseForm(formData, revokeSchema);
        if (!form.ok) return failure(intent, form.errors);
        const revoked = await revokeInvitation({
          ...scope,
          invitationId: form.data.invitationId,
        });
        if (!revoked) notFound("No such invitation.");
        return data<ActionResult>({
          intent,
          errors: {},
          message: "Invitation withdrawn.",
        });
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

function InviteForm({ result }: { result?: ActionResult }) {
  const navigation = useNavigation();
  const busy =
    navigation.state === "submitting" &&
    navigation.formData?.get("intent") === "invite";
  const errors = result?.intent === "invite" ? result.errors : {};
  return (
    <Card aria-labelledby="invite-heading">
      <h2 id="invite-heading" className="text-lg">
        Invite someone
      </h2>
      <p className="mt-1 text-ink-muted">
        They get an e-mail with a link that works for {INVITATION_DAYS} days.
      </p>
      <Form
        method="post"
        className="mt-4 grid gap-4 sm:grid-cols-[minmax(0,2fr)_minmax(0,1fr)_auto] sm:items-end"
        noValidate
      >
        <input type="hidden" name="intent" value="invite" />
        <Field
          label="E-mail address"
          name="email"
          type="email"
          required
          error={errors.email}
        />
        <SelectField
          label="Role"
          name="role"
          defaultValue="energy_manager"
          error={errors.role}
        >
          {roles.map((r) => (
            <option key={r} value={r}>
              {roleLabels[r]}
            </option>
          ))}
        </SelectField>
        <Button type="submit" disabled={busy}>
          {busy ? "Sending…" : "Send invitation"}
        </Button>
      </Form>
      {errors.form ? (
        <div className="mt-3">
          <Notice tone="error">{errors.form}</Notice>
        </div>
      ) : null}
    </Card>
  );
}

function MemberRow({
  member,
  manage,
  isSelf,
  refusal,
}: {
  member: {
    userId: string;
    name: string;
    email: string;
    role: Role;
    joinedAt: Date;
  };
  manage: boolean;
  isSelf: boolean;
  /** The action's answer when it refused a change to this member. */
  refusal: ActionResult | undefined;
}) {
  const roleForm = useRef<HTMLFormElement>(null);
  // A refused change (the last owner's demotion) stored nothing, so the menu
  // goes back to the stored role instead of showing the refused one. Each
  // answer is a new object, so a second refusal resets the menu again.
  useEffect(() => {
    if (refusal) roleForm.current?.reset();
  }, [refusal]);
  return (
    <li className="grid gap-3 py-4 md:grid-cols-[minmax(0,2fr)_minmax(0,2fr)_auto] md:items-center">
      <div>
        <p className="font-semibold">
          {member.name}{" "}
          {isSelf ? (
            <span className="font-normal text-ink-muted">(you)</span>
          ) : null}
        </p>
        <p className="text-sm text-ink-muted">{member.email}</p>
        <p className="text-sm text-ink-faint">
          Joined {dayUtc(member.joinedAt)}
        </p>
      </div>
      {manage ? (
        <Form ref={roleForm} method="post" className="flex items-end gap-2">
          <input type="hidden" name="intent" value="change-role" />
          <input type="hidden" name="userId" value={member.userId} />
          <SelectField
            label={`Role of ${member.name}`}
            hideLabel
            name="role"
            defaultValue={member.role}
            className="grow"
          >
            {roles.map((r) => (
              <option key={r} value={r}>
                {roleLabels[r]}
              </option>
            ))}
          </SelectField>
          <Button type="submit" variant="secondary">
            Save
          </Button>
        </Form>
      ) : (
        <div>
          <Badge tone={member.role === "owner" ? "copper" : "spruce"}>
            {roleLabels[member.role]}
          </Badge>
          <p className="mt-1 text-sm text-ink-muted">
            {roleDescriptions[member.role]}
          </p>
        </div>
      )}
      {manage ? (
        <details className="md:justify-self-end">
          <summary className="cursor-pointer rounded-lg px-3 py-2 font-semibold text-danger-700 hover:bg-danger-50">
            {isSelf ? "Leave…" : "Remove…"}
          </summary>
          <Form
            method="post"
            className="mt-2 flex flex-col gap-2 rounded-lg border border-danger-600/30 bg-danger-50 p-3"
          >
            <input type="hidden" name="intent" value="remove" />
            <input type="hidden" name="userId" value={member.userId} />
            <p className="text-sm">
              {member.name} loses access to this organisation at once.
            </p>
            <Button type="submit" variant="danger">
              Remove {member.name}
            </Button>
          </Form>
        </details>
      ) : null}
    </li>
  );
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
        <Card aria-labelledby="members-heading">
          <h2 id="members-heading" className="text-lg">
            {members.length} member{members.length === 1 ? "" : "s"}
          </h2>
          <ul className="divide-y divide-line">
            {members.map((m) => (
              <MemberRow
                // Keyed by the stored role too: after a saved change the row
                // starts afresh, so its menu's default is the new role.
                key={`${m.userId}:${m.role}`}
                member={m}
                manage={manage}
                isSelf={m.userId === currentUserId}
                refusal={
                  result?.intent === "change-role" &&
                  result.subject === m.userId
                    ? result
                    : undefined
                }
              />
            ))}
          </ul>
        </Card>
        {manage ? (
          <Card aria-labelledby="invitations-heading">
            <h2 id="invitations-heading" className="text-lg">
              Pending invitations
            </h2>
            {invitations.length === 0 ? (
              <div className="mt-3">
                <EmptyState title="No pending invitations">
                  Invitations you send appear here until they are accepted.
                </EmptyState>
              </div>
            ) : (
              <ul className="divide-y divide-line">
                {invitations.map((inv) => (
                  <li
                    key={inv.id}
                    className="flex flex-wrap items-center justify-between gap-3 py-3"
                  >
                    <div>
                      <p className="font-semibold">{inv.email}</p>
                      <p className="text-sm text-ink-muted">
                        {roleLabels[inv.role]} · expires{" "}
                        {dateTimeUtc(inv.expiresAt)}
                      </p>
                    </div>
                    <Form method="post">
                      <input type="hidden" name="intent" value="revoke" />
                      <input type="hidden" name="invitationId" value={inv.id} />
                      <Button type="submit" variant="secondary">
                        Withdraw
                      </Button>
                    </Form>
                  </li>
                ))}
              </ul>
            )}
          </Card>
        ) : null}
      </div>
    </>
  );
}
