import { data, Form, Link, redirect } from "react-router";
import { z } from "zod";
import { AuthFrame } from "~/components/auth-frame";
import { Button, Notice } from "~/components/ui";
import {
  resetPassword,
  resetTokenState,
  type ResetTokenState,
} from "~/auth/password-reset.server";
import { newPasswordField, parseForm } from "~/lib/forms";
import type { Route } from "./+types/reset-password";
import { NewPasswordFields } from "~/components/new-password-fields";

export const meta: Route.MetaFunction = () => [
  { title: "Choose a new password · Joulebook" },
];

const schema = z
  .strictObject({ password: newPasswordField, confirm: z.string().max(200) })
  .refine((v) => v.password === v.confirm, {
    path: ["confirm"],
    message: "The two passwords differ.",
  });

const stateMessages: Record<Exclude<ResetTokenState, "valid">, string> = {
  expired: "This link has expired. Ask for a new one.",
  used: "This link has already been used. Ask for a new one if you need to.",
  ended:
    "This link no longer works: the password was changed after it was sent. Ask for a new one if you need to.",
  unknown:
    "This link is not valid. Check that you copied all of it, or ask for a new one.",
};

export async function loader({ params }: Route.LoaderArgs) {
  return { state: await resetTokenState(params.token) };
}

export async function action({ request, params }: Route.ActionArgs) {
  const form = parseForm(await request.formData(), schema);
  if (!form.ok) return data({ errors: form.errors }, { status: 400 });
  const result = await resetPassword(params.token, form.data.password);
  if (!result.ok) {
    const message =
      stateMessages[result.state === "valid" ? "unknown" : result.state];
    return data(
      { errors: { form: message } as Record<string, string> },
      { status: 410 },
    );
  }
  throw redirect("/sign-in?reset=1");
}

export default function ResetPassword({
  loaderData,
  actionData,
}: Route.ComponentProps) {
  const errors: Record<string, string | undefined> = actionData?.errors ?? {};
  const { state } = loaderData;
  return (
    <AuthFrame
      title="Choose a new password"
      intro="Every signed-in device will be signed out."
    >
      {state !== "valid" ? (
        <Notice tone="error">{stateMessages[state]}</Notice>
      ) : (
        <Form method="post" className="flex flex-col gap-5" noValidate>
          {errors.form ? <Notice tone="error">{errors.form}</Notice> : null}
          <NewPasswordFields errors={errors} replacing />
          <Button type="submit">Set the new password</Button>
        </Form>
      )}
      <p className="mt-6">
        <Link
          to="/forgot-password"
          className="font-semibold text-spruce-700 underline-offset-4 hover:underline"
        >
          Ask for a new link
        </Link>
      </p>
    </AuthFrame>
  );
}
