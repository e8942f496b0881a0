import { data, Form, Link, redirect, useNavigation } from "react-router";
import { z } from "zod";
import { getUser, startSession } from "~/auth/session.server";
import { attemptSucceeded, claimSignUp } from "~/auth/throttle.server";
import { signUpOwner } from "~/billing/sign-up.server";
import { AuthFrame } from "~/components/auth-frame";
import { Button, Field, Notice } from "~/components/ui";
import { env } from "~/env.server";
import {
  emailField,
  nameField,
  newPasswordField,
  parseForm,
} from "~/lib/forms";
import { requestInfoContext } from "~/request-context";
import type { Route } from "./+types/sign-up";
import { NewPasswordFields } from "~/components/new-password-fields";

// Carries Retry-After of a refused sign-up onto the page's response.
export const headers: Route.HeadersFunction = ({ actionHeaders }) =>
  actionHeaders;

export const meta: Route.MetaFunction = () => [
  { title: "Create an organisation · Joulebook" },
];

const signUpSchema = z
  .strictObject({
    name: nameField,
    email: emailField,
    password: newPasswordField,
    confirm: z.string().max(200),
    organization: z
      .string({ error: "Enter the organisation's name." })
      .trim()
      .min(2, "Enter the organisation's name.")
      .max(120, "Use at most 120 characters."),
  })
  .refine((v) => v.password === v.confirm, {
    path: ["confirm"],
    message: "The two passwords differ.",
  });

export async function loader({ request }: Route.LoaderArgs) {
  if (await getUser(request)) throw redirect("/");
  return { trialDays: env().BILLING_TRIAL_DAYS };
}

function tooMany(retryAfterSeconds: number) {
  const minutes = Math.ceil(retryAfterSeconds / 60);
  return data(
    {
      errors: {
        form: `Too many organisations were created from this network in the last hour. Try again in ${minutes} minute${minutes === 1 ? "" : "s"}, or ask an owner to invite you to an existing organisation.`,
      } as Record<string, string>,
    },
    {
      status: 429,
      headers: { "Retry-After": String(retryAfterSeconds) },
    },
  );
}

export async function action({ request, context }: Route.ActionArgs) {
  if (await getUser(request)) throw redirect("/");
  const form = parseForm(await request.formData(), signUpSchema);
  if (!form.ok) return data({ errors: form.errors }, { status: 400 });
  const { clientAddress } = context.get(requestInfoContext);
  const claim = await claimSignUp(form.data.email, clientAddress);
  if (!claim.admitted) return tooMany(claim.retryAfterSeconds);
  const result = await signUpOwner({
    name: form.data.name,
    email: form.data.email,
    password: form.data.password,
    organizationName: form.data.organization,
  });
  if (!result.ok) {
    return data(
      {
        errors: {
          email:
            "An account already uses this address. Sign in instead, or use another address.",
        } as Record<string, string>,
      },
      { status: 409 },
    );
  }
  await attemptSucceeded(claim.attemptId);
  throw redirect(`/o/${result.organizationId}`, {
    headers: { "Set-Cookie": await startSession(request, result.userId) },
  });
}

export default function SignUp({
  loaderData,
  actionData,
}: Route.ComponentProps) {
  const errors: Record<string, string | undefined> = actionData?.errors ?? {};
  const busy = useNavigation().state === "submitting";
  return (
    <AuthFrame
      title="Create an organisation"
      intro={`You become its owner. The first ${loaderData.trialDays} days are free, with no card needed; finance staff subscribe when you are ready.`}
    >
      <Form method="post" className="flex flex-col gap-5" noValidate>
        {errors.form ? <Notice tone="error">{errors.form}</Notice> : null}
        <Field
          label="Organisation name"
          name="organization"
          autoComplete="organization"
          required
          autoFocus
          error={errors.organization}
        />
        <Field
          label="Your name"
          name="name"
          autoComplete="name"
          required
          error={errors.name}
        />
        <Field
          label="E-mail address"
          name="email"
          type="email"
          autoComplete="username"
          required
          error={errors.email}
        />
        <NewPasswordFields errors={errors} />
        <Button type="submit" disabled={busy}>
          {busy ? "Creating…" : "Create the organisation"}
        </Button>
        <p className="text-ink-muted">
          Already have an account?{" "}
          <Link
            to="/sign-in"
            className="font-semibold text-spruce-700 underline-offset-4 hover:underline"
          >
            Sign in
          </Link>
        </p>
      </Form>
    </AuthFrame>
  );
}
