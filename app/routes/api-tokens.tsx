import { data, Form } from "react-router";
import { notFound } from "~/auth/membership.server";
import { requirePermission } from "~/auth/page-access.server";
import { roleLabels, tokenRoles } from "~/auth/permissions";
import { NewTokenSecret } from "~/components/api-tokens/new-token-secret";
import { TokenList } from "~/components/api-tokens/token-list";
import {
  Button,
  Card,
  Field,
  Notice,
  PageHeader,
  SelectField,
} from "~/components/ui";
import { parseForm } from "~/lib/forms";
import { revokeBeingConfirmed } from "~/lib/revoke-confirmation";
import {
  createTokenSchema,
  DEFAULT_TOKEN_LIFETIME,
  expiryFor,
  revokeTokenSchema,
  tokenLifetimeLabels,
  tokenLifetimes,
} from "~/organizations/api-token-form";
import {
  createApiToken,
  listApiTokens,
  revokeApiToken,
} from "~/organizations/api-tokens.server";
import type { Route } from "./+types/api-tokens";

export const meta: Route.MetaFunction = () => [
  { title: "API tokens · Joulebook" },
];

export async function loader({ request, context }: Route.LoaderArgs) {
  const { organization } = requirePermission(context, "tokens.manage");
  const rows = await listApiTokens({ organizationId: organization.id });
  const tokens = rows.map((t) => ({
    ...t,
    createdAt: t.createdAt.toISOString(),
    expiresAt: t.expiresAt?.toISOString() ?? null,
    lastUsedAt: t.lastUsedAt?.toISOString() ?? null,
    revokedAt: t.revokedAt?.toISOString() ?? null,
  }));
  const confirming = revokeBeingConfirmed(request, tokens);
  return { tokens, confirming, now: new Date().toISOString() };
}

type Result = {
  intent: string;
  errors: Record<string, string>;
  secret?: string;
  name?: string;
  message?: string;
};

export async function action({ request, context }: Route.ActionArgs) {
  const { organization, user } = requirePermission(context, "tokens.manage");
  const formData = await request.formData();
  const intent = String(formData.get("intent") ?? "");
  const scope = { organizationId: organization.id, actorUserId: user.id };
  if (intent === "create") {
    const form = parseForm(formData, createTokenSchema);
    if (!form.ok)
      return data<Result>({ intent, errors: form.errors }, { status: 400 });
    const { name, role, lifetime } = form.data;
    const { secret } = await createApiToken({
      ...scope,
      name,
      role,
      expiresAt: expiryFor(lifetime, new Date()),
    });
    return data<Result>({ intent, errors: {}, secret, name });
  }
  const form = parseForm(formData, revokeTokenSchema);
  if (!form.ok)
    return data<Result>({ intent, errors: form.errors }, { status: 400 });
  if (!(await revokeApiToken({ ...scope, tokenId: form.data.tokenId })))
    notFound("No such API token.");
  return data<Result>({
    intent,
    errors: {},
    message: "API token revoked: it is refused from now on.",
  });
}

function CreateTokenForm({
  errors,
}: {
  errors: Record<string, string | undefined>;
}) {
  return (
    <Card aria-labelledby="new-token-heading">
      <h2 id="new-token-heading" className="text-lg">
        Create an API token
      </h2>
      <Form
        method="post"
        className="mt-4 flex flex-col gap-4 lg:flex-row lg:items-end"
        noValidate
      >
        <input type="hidden" name="intent" value="create" />
        <Field
          label="Token name"
          name="name"
          required
          className="grow"
          error={errors.name}
        />
        <SelectField
          label="Acts as"
          name="role"
          defaultValue="auditor"
          error={errors.role}
        >
          {tokenRoles.map((role) => (
            <option key={role} value={role}>
              {role === "auditor"
                ? `${roleLabels[role]} (read-only)`
                : roleLabels[role]}
            </option>
          ))}
        </SelectField>
        <SelectField
          label="Expires after"
          name="lifetime"
          defaultValue={DEFAULT_TOKEN_LIFETIME}
          error={errors.lifetime}
        >
          {tokenLifetimes.map((lifetime) => (
            <option key={lifetime} value={lifetime}>
              {tokenLifetimeLabels[lifetime]}
            </option>
          ))}
        </SelectField>
        <Button type="submit">Create and show token</Button>
      </Form>
    </Card>
  );
}

export default function ApiTokens({
  loaderData,
  actionData,
}: Route.ComponentProps) {
  const result = actionData as Result | undefined;
  const errors: Record<string, string | undefined> =
    result?.intent === "create" ? result.errors : {};
  const revokeError =
    result?.intent === "revoke"
      ? Object.values(result.errors).join(" ") || undefined
      : undefined;
  return (
    <>
      <PageHeader
        title="API tokens"
        description="For scripts and reporting tools that use the JSON API. A token acts with its role in this organisation only."
      />
      <div className="flex flex-col gap-6">
        {result?.secret && result.name ? (
          <NewTokenSecret name={result.name} secret={result.secret} />
        ) : null}
        {result?.message ? (
          <Notice tone="success">{result.message}</Notice>
        ) : null}
        {revokeError ? <Notice tone="error">{revokeError}</Notice> : null}
        <CreateTokenForm errors={errors} />
        <Card aria-labelledby="token-list-heading">
          <h2 id="token-list-heading" className="text-lg">
            All API tokens
          </h2>
          <TokenList
            tokens={loaderData.tokens}
            confirming={loaderData.confirming}
            now={loaderData.now}
          />
        </Card>
      </div>
    </>
  );
}
