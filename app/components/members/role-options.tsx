import { roleLabels, roles } from "~/auth/permissions";

/** The four roles, as the options of a role menu. */
export function RoleOptions() {
  return (
    <>
      {roles.map((r) => (
        <option key={r} value={r}>
          {roleLabels[r]}
        </option>
      ))}
    </>
  );
}
