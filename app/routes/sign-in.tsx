import { data, Form, Link, redirect, useNavigation } from "react-router";
import { z } from "zod";
import { AuthFrame } from "~/components/auth-frame";
import { Button, Field, Notice } from "~/components/ui";
import {
  deviceTokenCookie,
  readDeviceToken,
} from "~/auth/device-cookie.server";
import { getUser, startSession } from "~/auth/session.server";
import { safeRedirectPath } from "~/lib/redirect";
import { signIn } from "~/auth/sign-in.server";
import { emailField, parseForm } from "~/lib/forms";
import { requestInfoContext } from "~/request-context";
import type { Route } from "./+types/sign-in";

// Carries Retry-After of a throttled attempt onto the page's response.
export const headers: Route.HeadersFunction = ({ actionHeaders }) =>
  actionHeaders;

export const meta: Route.MetaFunction = () => [
  { title: "Sign in · Joulebook" },
];

const signInSchema = z.strictObject({
  email: emailField,
  password: z
    .string({ error: "Enter your password." })
    .min(1, "Enter your password.")
    .max(200, "Use at most 200 characters."),
  redirectTo: z.string().max(2000).optional(),
});

export async function loader({ request }: Route.LoaderArgs) {
  const url = new URL(request.url);
  if (await getUser(request)) {
    throw redirect(safeRedirectPath(url.searchParams.get("redirectTo")));
  }
  return {
    // Only a safe path reaches the form, so a hostile link cannot make the
    // sign-in itself fail on a hidden field.
    redirectTo: safeRedirectPath(url.searchParams.get("redirectTo"), ""),
    reset: url.searchParams.get("reset") === "1",
  };
}

export async function action({ request, context }: Route.ActionArgs) {
  const form = parseForm(await request.formData(), signInSchema);
  if (!form.ok) return data({ errors: form.errors }, { status: 400 });
  const { clientAddress } = context.get(requestInfoContext);
  const device = await deviceTokenCookie(
    request,
    await readDeviceToken(request),
  );
  const result = await signIn(
    form.data.email,
    form.data.password,
    clientAddress,
    device.token,
  );
  if (result.ok) {
    const headers = new Headers();
    headers.append("Set-Cookie", await startSession(request, result.userId));
    headers.append("Set-Cookie", device.setCookie);
    throw redirect(safeRedirectPath(form.data.redirectTo), { headers });
  }
  if (result.reason === "throttled") {
    const minutes = Math.ceil(result.retryAfterSeconds / 60);
    return data(
      {
        errors: {
          form: `Too many failed attempts. Try again in ${minutes} minute${minutes === 1 ? "" : "s"}, or reset your password.`,
        },
      },
      {
        status: 429,
        headers: { "Retry-After": String(result.retryAfterSeconds) },
      },
    );
  }
  return data(
    {
      errors: {
        form: "That e-mail address and password do not match an account.",
      },
    },
    { status: 400 },
  );
}

export default function SignIn({
  loaderData,
  actionData,
}: Route.ComponentProps) {
  const errors: Record<string, string | undefined> = actionData?.errors ?? {};
  const busy = useNavigation().state === "submitting";
  return (
    <AuthFrame
      title="Sign in"
      intro="Use the e-mail address your organisation invited."
    >
      <Form method="post" className="flex flex-col gap-5" noValidate>
        {loaderData.reset ? (
          <Notice tone="success">
            Your password was changed. Sign in with the new one.
          </Notice>
        ) : null}
        {errors.form ? <Notice tone="error">{errors.form}</Notice> : null}
        <input type="hidden" name="redirectTo" value={loaderData.redirectTo} />
        <Field
          label="E-mail address"
          name="email"
          type="email"
          autoComplete="username"
          required
          autoFocus
          error={errors.email}
        />
        <Field
          label="Password"
          name="password"
          type="password"
          autoComplete="current-password"
          required
          error={errors.password}
        />
        <Button type="submit" disabled={busy}>
          {busy ? "Signing in…" : "Sign in"}
        </Button>
        <Link
          to="/forgot-password"
          className="font-semibold text-spruce-700 underline-offset-4 hover:underline"
        >
          Forgot your password?
        </Link>
        <p className="text-ink-muted">
          New to Joulebook?{" "}
          <Link
            to="/sign-up"
            className="font-semibold text-spruce-700 underline-offset-4 hover:underline"
          >
            Create an organisation
          </Link>
        </p>
      </Form>
    </AuthFrame>
  );
}
