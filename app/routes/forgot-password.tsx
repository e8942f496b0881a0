import { data, Form, Link, useNavigation } from "react-router";
import { z } from "zod";
import { AuthFrame } from "~/components/auth-frame";
import { Button, Field, Notice } from "~/components/ui";
import { RESET_LINK_MINUTES } from "~/auth/policy";
import { requestPasswordReset } from "~/auth/password-reset.server";
import { emailField, parseForm } from "~/lib/forms";
import { requestInfoContext } from "~/request-context";
import type { Route } from "./+types/forgot-password";

export const meta: Route.MetaFunction = () => [
  { title: "Reset your password · Joulebook" },
];

const schema = z.strictObject({ email: emailField });

export async function action({ request, context }: Route.ActionArgs) {
  const form = parseForm(await request.formData(), schema);
  if (!form.ok)
    return data({ errors: form.errors, sent: false }, { status: 400 });
  try {
    const { clientAddress } = context.get(requestInfoContext);
    await requestPasswordReset(form.data.email, clientAddress);
  } catch (error) {
    console.error("[password-reset]", error);
    return data(
      {
        errors: {
          form: "The e-mail could not be sent just now. Try again in a minute.",
        },
        sent: false,
      },
      { status: 503 },
    );
  }
  return { errors: {} as Record<string, string>, sent: true };
}

export default function ForgotPassword({ actionData }: Route.ComponentProps) {
  const errors: Record<string, string | undefined> = actionData?.errors ?? {};
  const busy = useNavigation().state === "submitting";
  return (
    <AuthFrame
      title="Reset your password"
      intro={`We'll e-mail a link that works once, for ${RESET_LINK_MINUTES} minutes.`}
    >
      {actionData?.sent ? (
        <Notice tone="success" title="Check your e-mail">
          If an account uses that address, a reset link is on its way.
        </Notice>
      ) : (
        <Form method="post" className="flex flex-col gap-5" noValidate>
          {errors.form ? <Notice tone="error">{errors.form}</Notice> : null}
          <Field
            label="E-mail address"
            name="email"
            type="email"
            autoComplete="email"
            required
            error={errors.email}
          />
          <Button type="submit" disabled={busy}>
            {busy ? "Sending…" : "Send the link"}
          </Button>
        </Form>
      )}
      <p className="mt-6">
        <Link
          to="/sign-in"
          className="font-semibold text-spruce-700 underline-offset-4 hover:underline"
        >
          Back to sign-in
        </Link>
      </p>
    </AuthFrame>
  );
}
