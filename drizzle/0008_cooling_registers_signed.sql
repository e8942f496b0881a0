-- Hand-written. A cooling meter's register counts the cooling it delivered, a
-- magnitude; that cooling is heat leaving the site, so its hours are signed
-- negative on an import meter, as chilled water measured by flow and return
-- always was (app/ingest/prepare-readings.server.ts, siteSign). Energy such a
-- meter stored before carried the register's sign: every stored figure of it
-- turns. Negating every hour negates every sum exactly, so the rollups stay
-- the sums of their hours and the adjusting entries their changes.
UPDATE "intervals" i SET "energy_kwh" = -i."energy_kwh"
  FROM "meters" m
 WHERE m."organization_id" = i."organization_id" AND m."id" = i."meter_id"
   AND m."carrier" = 'cooling' AND m."quantity" = 'heat_register';--> statement-breakpoint
UPDATE "raw_readings" r SET "energy_kwh" = -r."energy_kwh"
  FROM "meters" m
 WHERE m."organization_id" = r."organization_id" AND m."id" = r."meter_id"
   AND m."carrier" = 'cooling' AND m."quantity" = 'heat_register'
   AND r."energy_kwh" IS NOT NULL;--> statement-breakpoint
UPDATE "monthly_rollups" r SET "energy_kwh" = -r."energy_kwh", "estimated_kwh" = -r."estimated_kwh"
  FROM "meters" m
 WHERE m."organization_id" = r."organization_id" AND m."id" = r."meter_id"
   AND m."carrier" = 'cooling' AND m."quantity" = 'heat_register';--> statement-breakpoint
UPDATE "ledger_adjustments" a SET "delta_kwh" = -a."delta_kwh"
  FROM "meters" m
 WHERE m."organization_id" = a."organization_id" AND m."id" = a."meter_id"
   AND m."carrier" = 'cooling' AND m."quantity" = 'heat_register';--> statement-breakpoint
-- The wrong-sign flag was set on these hours against the old sign: set it
-- again against the new one (measured hours that still leave the expected
-- direction: positive on an import meter, negative on an export meter).
UPDATE "intervals" i SET "flags" = CASE
         WHEN i."quality" = 'measured'
          AND i."energy_kwh" * (CASE WHEN m."orientation" = 'export' THEN 1 ELSE -1 END) < 0
         THEN array_append(array_remove(i."flags", 'wrong_sign'), 'wrong_sign')
         ELSE array_remove(i."flags", 'wrong_sign') END
  FROM "meters" m
 WHERE m."organization_id" = i."organization_id" AND m."id" = i."meter_id"
   AND m."carrier" = 'cooling' AND m."quantity" = 'heat_register';
