import { data, Form, Link, redirect } from "react-router";
import { z } from "zod";
import { changePassword } from "~/auth/change-password.server";
import { roleLabels } from "~/auth/permissions";
import { signedInPrincipal, signedInUser } from "~/auth/page-access.server";
import {
  Badge,
  Button,
  Card,
  Field,
  Notice,
  PageHeader,
} from "~/components/ui";
import { newPasswordField, parseForm } from "~/lib/forms";
import type { Route } from "./+types/account";
import { ListCard } from "~/components/list-card";
import { NewPasswordFields } from "~/components/new-password-fields";

export const meta: Route.MetaFunction = () => [
  { title: "Account · Joulebook" },
];

const schema = z
  .strictObject({
    current: z.string().min(1, "Enter your current password.").max(200),
    password: newPasswordField,
    confirm: z.string().max(200),
  })
  .refine((v) => v.password === v.confirm, {
    path: ["confirm"],
    message: "The two passwords differ.",
  });

export async function loader({ request, context }: Route.LoaderArgs) {
  const principal = signedInPrincipal(context);
  const { user } = principal;
  return {
    changed: new URL(request.url).searchParams.get("changed") === "1",
    user: { name: user.name, email: user.email },
    organizations: await principal.memberships(),
  };
}

export async function action({ request, context }: Route.ActionArgs) {
  const user = signedInUser(context);
  const form = parseForm(await request.formData(), schema);
  if (!form.ok)
    return data({ errors: form.errors, changed: false }, { status: 400 });
  const result = await changePassword(
    request,
    user.id,
    form.data.current,
    form.data.password,
  );
  if (!result.ok) {
    return data(
      {
        errors: { current: "That is not your current password." } as Record<
          string,
          string
        >,
        changed: false,
      },
      { status: 400 },
    );
  }
  // A redirect: the old session is gone, so the page must load afresh with
  // the new cookie rather than revalidate with the old one.
  throw redirect("/account?changed=1", {
    headers: { "Set-Cookie": result.cookie },
  });
}

export default function Account({
  loaderData,
  actionData,
}: Route.ComponentProps) {
  const errors: Record<string, string | undefined> = actionData?.errors ?? {};
  const { user, organizations } = loaderData;
  return (
    <>
      <PageHeader
        title="Account"
        description={`${user.name} · ${user.email}`}
      />
      <div className="grid gap-6 lg:grid-cols-2">
        <ListCard
          headingId="orgs-heading"
          title="Your organisations"
          empty={
            organizations.length === 0
              ? {
                  title: "No organisation yet",
                  text: "Ask an owner to invite you by e-mail.",
                }
              : null
          }
          list={{ className: "mt-3" }}
        >
          {organizations.map((org) => (
            <li key={org.id} className="flex items-center justify-between py-3">
              <Link
                to={`/o/${org.id}`}
                className="font-semibold text-spruce-700 underline-offset-4 hover:underline"
              >
                {org.name}
              </Link>
              <Badge tone="spruce">{roleLabels[org.role]}</Badge>
            </li>
          ))}
        </ListCard>
        <Card aria-labelledby="password-heading">
          <h2 id="password-heading" className="text-lg">
            Change password
          </h2>
          <p className="mt-1 text-ink-muted">
            Every other device signed in to your account is signed out.
          </p>
          <Form method="post" className="mt-4 flex flex-col gap-4" noValidate>
            {loaderData.changed && !actionData ? (
              <Notice tone="success">
                Password changed. Other sessions have ended.
              </Notice>
            ) : null}
            {errors.form ? <Notice tone="error">{errors.form}</Notice> : null}
            <Field
              label="Current password"
              name="current"
              type="password"
              autoComplete="current-password"
              required
              error={errors.current}
            />
            <NewPasswordFields errors={errors} replacing />
            <Button type="submit">Change password</Button>
          </Form>
        </Card>
      </div>
    </>
  );
}
