import { Field } from "./ui";

/**
 * A new password typed twice, as every form that sets one asks for it. The
 * rule in the hint is the one `newPasswordField` (app/lib/forms.ts) checks.
 */
export function NewPasswordFields({
  errors,
  replacing = false,
}: {
  errors: { password?: string; confirm?: string };
  /** True where an existing password is being changed. */
  replacing?: boolean;
}) {
  return (
    <>
      <Field
        label={replacing ? "New password" : "Choose a password"}
        name="password"
        type="password"
        autoComplete="new-password"
        hint="At least 10 characters."
        required
        error={errors.password}
      />
      <Field
        label={replacing ? "Repeat the new password" : "Repeat the password"}
        name="confirm"
        type="password"
        autoComplete="new-password"
        required
        error={errors.confirm}
      />
    </>
  );
}
