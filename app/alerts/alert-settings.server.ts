import { and, eq } from "drizzle-orm";
import { managers, type Role } from "~/auth/permissions";
import { db } from "~/db/client.server";
import { alertSettings } from "~/db/schema";
import { NO_DATA_AFTER_HOURS } from "./no-data";

export interface AlertPreferences {
  silentMeter: boolean;
  residual: boolean;
  monthReady: boolean;
  plantFault: boolean;
  silentHours: number;
}

/** Managers get every alert until they choose otherwise; the others opt in. */
export function alertsOnByDefault(role: string): boolean {
  return (managers as readonly string[]).includes(role);
}

const preferenceColumns = {
  silentMeter: alertSettings.silentMeter,
  residual: alertSettings.residual,
  monthReady: alertSettings.monthReady,
  plantFault: alertSettings.plantFault,
  silentHours: alertSettings.silentHours,
};

/** A person's choices, or the defaults for their role when they made none. */
export async function alertPreferences(
  organizationId: string,
  userId: string,
  role: Role,
): Promise<AlertPreferences> {
  const [chosen] = await db
    .select(preferenceColumns)
    .from(alertSettings)
    .where(
      and(
        eq(alertSettings.organizationId, organizationId),
        eq(alertSettings.userId, userId),
      ),
    );
  const byDefault = alertsOnByDefault(role);
  return (
    chosen ?? {
      silentMeter: byDefault,
      residual: byDefault,
      monthReady: byDefault,
      plantFault: byDefault,
      silentHours: NO_DATA_AFTER_HOURS,
    }
  );
}

export async function saveAlertPreferences(
  organizationId: string,
  userId: string,
  p: AlertPreferences,
): Promise<void> {
  const choices = {
    silentMeter: p.silentMeter,
    residual: p.residual,
    monthReady: p.monthReady,
    plantFault: p.plantFault,
    silentHours: p.silentHours,
  };
  await db
    .insert(alertSettings)
    .values({ organizationId, userId, ...choices })
    .onConflictDoUpdate({
      target: [alertSettings.organizationId, alertSettings.userId],
      set: choices,
    });
}
