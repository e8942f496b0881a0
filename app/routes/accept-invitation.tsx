import { data, Form, Link, redirect } from "react-router";
import { z } from "zod";
import { AuthFrame } from "~/components/auth-frame";
import { Badge, Button, Field, Notice } from "~/components/ui";
import { createUser } from "~/auth/create-user.server";
import { roleLabels } from "~/auth/permissions";
import { findUserByEmail } from "~/auth/sign-in.server";
import { getUser, startSession } from "~/auth/session.server";
import { db } from "~/db/client.server";
import { nameField, newPasswordField, parseForm } from "~/lib/forms";
import {
  acceptInvitation,
  acceptInvitationIn,
  findInvitation,
  type InvitationState,
} from "~/organizations/members.server";
import type { Route } from "./+types/accept-invitation";
import { NewPasswordFields } from "~/components/new-password-fields";

export const meta: Route.MetaFunction = () => [
  { title: "Invitation · Joulebook" },
];

const stateMessages: Record<Exclude<InvitationState, "valid">, string> = {
  expired:
    "This invitation has expired. Ask the person who invited you to send a new one.",
  accepted: "This invitation has already been accepted.",
  revoked: "This invitation was withdrawn.",
  unknown:
    "This invitation link is not valid. Check that you copied all of it.",
};

const acceptSchema = z.strictObject({ intent: z.literal("accept") });
const registerSchema = z
  .strictObject({
    intent: z.literal("register"),
    name: nameField,
    password: newPasswordField,
    confirm: z.string().max(200),
  })
  .refine((v) => v.password === v.confirm, {
    path: ["confirm"],
    message: "The two passwords differ.",
  });

export async function loader({ request, params }: Route.LoaderArgs) {
  const { state, invitation } = await findInvitation(params.token);
  const user = await getUser(request);
  if (!invitation || state !== "valid") {
    return {
      state,
      invitation: null,
      signedInEmail: user?.email ?? null,
      accountExists: false,
    };
  }
  const accountExists = Boolean(await findUserByEmail(invitation.email));
  return {
    state,
    invitation: {
      organizationName: invitation.organizationName,
      email: invitation.email,
      role: invitation.role,
    },
    signedInEmail: user?.email ?? null,
    accountExists,
  };
}

export async function action({ request, params }: Route.ActionArgs) {
  const formData = await request.formData();
  const user = await getUser(request);
  if (formData.get("intent") === "accept") {
    const form = parseForm(formData, acceptSchema);
    if (!form.ok || !user)
      return data(
        { errors: { form: "Sign in first." } as Record<string, string> },
        { status: 400 },
      );
    const result = await acceptInvitation({
      token: params.token,
      userId: user.id,
      userEmail: user.email,
    });
    if (!result.ok)
      return data(
        { errors: { form: result.reason } as Record<string, string> },
        { status: 409 },
      );
    throw redirect(`/o/${result.organizationId}`);
  }
  const form = parseForm(formData, registerSchema);
  if (!form.ok) return data({ errors: form.errors }, { status: 400 });
  const { invitation, state } = await findInvitation(params.token);
  if (!invitation || state !== "valid") {
    return data(
      {
        errors: {
          form: stateMessages[state === "valid" ? "unknown" : state],
        } as Record<string, string>,
      },
      { status: 410 },
    );
  }
  if (await findUserByEmail(invitation.email)) {
    return data(
      {
        errors: {
          form: "An account already uses this address: sign in to accept.",
        } as Record<string, string>,
      },
      { status: 409 },
    );
  }
  const outcome = await db
    .transaction(async (tx) => {
      const userId = await createUser(tx, {
        email: invitation.email,
        name: form.data.name,
        password: form.data.password,
      });
      const accepted = await acceptInvitationIn(tx, {
        token: params.token,
        userId,
        userEmail: invitation.email,
      });
      if (!accepted.ok) tx.rollback();
      return { userId, accepted };
    })
    .catch(() => null);
  if (!outcome || !outcome.accepted.ok) {
    return data(
      {
        errors: {
          form: "The invitation could not be accepted; nothing was saved. Try again.",
        } as Record<string, string>,
      },
      { status: 409 },
    );
  }
  throw redirect(`/o/${outcome.accepted.organizationId}`, {
    headers: { "Set-Cookie": await startSession(request, outcome.userId) },
  });
}

export default function AcceptInvitation({
  loaderData,
  actionData,
  params,
}: Route.ComponentProps) {
  const errors: Record<string, string | undefined> = actionData?.errors ?? {};
  const { state, invitation, signedInEmail, accountExists } = loaderData;
  if (state !== "valid" || !invitation) {
    return (
      <AuthFrame title="Invitation">
        <Notice tone="error">
          {stateMessages[state === "valid" ? "unknown" : state]}
        </Notice>
      </AuthFrame>
    );
  }
  const intro = (
    <p>
      You are invited to <strong>{invitation.organizationName}</strong> as{" "}
      <Badge tone="spruce">{roleLabels[invitation.role]}</Badge> with the
      address <strong>{invitation.email}</strong>.
    </p>
  );
  const here = `/invitations/${params.token}`;
  let body;
  if (signedInEmail && signedInEmail.toLowerCase() === invitation.email) {
    body = (
      <Form method="post" className="flex flex-col gap-4">
        {errors.form ? <Notice tone="error">{errors.form}</Notice> : null}
        <input type="hidden" name="intent" value="accept" />
        <Button type="submit">Join {invitation.organizationName}</Button>
      </Form>
    );
  } else if (signedInEmail) {
    body = (
      <Notice tone="caution">
        You are signed in as {signedInEmail}. Sign out and sign in as{" "}
        {invitation.email} to accept.
      </Notice>
    );
  } else if (accountExists) {
    body = (
      <Link
        className="font-semibold text-spruce-700 underline"
        to={`/sign-in?redirectTo=${encodeURIComponent(here)}`}
      >
        Sign in as {invitation.email} to accept
      </Link>
    );
  } else {
    body = (
      <Form method="post" className="flex flex-col gap-5" noValidate>
        {errors.form ? <Notice tone="error">{errors.form}</Notice> : null}
        <input type="hidden" name="intent" value="register" />
        <Field
          label="Your name"
          name="name"
          autoComplete="name"
          required
          error={errors.name}
        />
        <NewPasswordFields errors={errors} />
        <Button type="submit">Create the account and join</Button>
      </Form>
    );
  }
  return (
    <AuthFrame title="You're invited" intro={intro}>
      {body}
    </AuthFrame>
  );
}
