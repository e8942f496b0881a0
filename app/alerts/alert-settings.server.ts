import { pool } from "~/db/client.server";
import { managers, type Role } from "~/auth/permissions";

export interface AlertPreferences {
  silentMeter: boolean;
  residual: boolean;
  monthReady: boolean;
  silentHours: number;
}

/** Managers get every alert until they choose otherwise; the others opt in. */
export function alertsOnByDefault(role: string): boolean {
  return (managers as readonly string[]).includes(role);
}

/** A person's choices, or the defaults for their role when they made none. */
export async function alertPreferences(
  organizationId: string,
  userId: string,
  role: Role,
): Promise<AlertPreferences> {
  const { rows } = await pool.query<{
    silent_meter: boolean;
    residual: boolean;
    month_ready: boolean;
    silent_hours: number;
  }>(
    "select silent_meter, residual, month_ready, silent_hours from alert_settings where organization_id = $1 and user_id = $2",
    [organizationId, userId],
  );
  const byDefault = alertsOnByDefault(role);
  const r = rows[0];
  return r
    ? {
        silentMeter: r.silent_meter,
        residual: r.residual,
        monthReady: r.month_ready,
        silentHours: r.silent_hours,
      }
    : {
        silentMeter: byDefault,
        residual: byDefault,
        monthReady: byDefault,
        silentHours: 24,
      };
}

export async function saveAlertPreferences(
  organizationId: string,
  userId: string,
  p: AlertPreferences,
): Promise<void> {
  await pool.query(
    `insert into alert_settings (organization_id, user_id, silent_meter, residual, month_ready, silent_hours)
     values ($1, $2, $3, $4, $5, $6)
     on conflict (organization_id, user_id) do update set
       silent_meter = excluded.silent_meter, residual = excluded.residual,
       month_ready = excluded.month_ready, silent_hours = excluded.silent_hours`,
    [
      organizationId,
      userId,
      p.silentMeter,
      p.residual,
      p.monthReady,
      p.silentHours,
    ],
  );
}
