ALTER TABLE "audit_log" ADD COLUMN "actor_gateway_id" uuid;--> statement-breakpoint
ALTER TABLE "audit_log" ADD COLUMN "site_id" uuid;--> statement-breakpoint
ALTER TABLE "audit_log" ADD COLUMN "meter_id" uuid;--> statement-breakpoint
ALTER TABLE "audit_log" ADD COLUMN "reason" text;--> statement-breakpoint
ALTER TABLE "audit_log" ADD COLUMN "before" jsonb;--> statement-breakpoint
ALTER TABLE "audit_log" ADD COLUMN "after" jsonb;--> statement-breakpoint
CREATE INDEX "audit_log_occurred_idx" ON "audit_log" USING btree ("organization_id","occurred_at");--> statement-breakpoint
-- Entries written before these columns existed kept everything in details;
-- each kind gets its place, reason and before/after as they are written now
-- (app/audit/record-audit.server.ts), so filters and the Audit trail page read
-- one shape. Hour corrections keep their own shape (the reader places them).
UPDATE "audit_log" SET "meter_id" = "subject"::uuid
  WHERE "action" LIKE 'meter.%' AND "subject" ~* '^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$';--> statement-breakpoint
UPDATE "audit_log" SET "site_id" = "subject"::uuid
  WHERE "action" IN ('site.created', 'site.updated', 'weather.uploaded')
    AND "subject" ~* '^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$';--> statement-breakpoint
UPDATE "audit_log" SET "site_id" = ("details"->>'siteId')::uuid
  WHERE "action" IN ('month.closed', 'month.reopened', 'baseline.saved', 'report.requested')
    AND "details"->>'siteId' ~* '^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$';--> statement-breakpoint
UPDATE "audit_log" a SET "site_id" = m."site_id"
  FROM "meters" m
  WHERE a."meter_id" IS NOT NULL AND a."site_id" IS NULL
    AND m."organization_id" = a."organization_id" AND m."id" = a."meter_id";--> statement-breakpoint
UPDATE "audit_log" SET "before" = jsonb_build_object('state', 'open'),
    "after" = jsonb_build_object('state', 'closed')
  WHERE "action" = 'month.closed';--> statement-breakpoint
UPDATE "audit_log" SET "reason" = "details"->>'reason',
    "before" = jsonb_build_object('state', 'closed'),
    "after" = jsonb_build_object('state', 'open')
  WHERE "action" = 'month.reopened';--> statement-breakpoint
UPDATE "audit_log" SET "before" = jsonb_build_object('role', "details"->'from'),
    "after" = jsonb_build_object('role', "details"->'to')
  WHERE "action" = 'member.role_changed';--> statement-breakpoint
UPDATE "audit_log" SET "before" = "details"
  WHERE "action" = 'member.removed';--> statement-breakpoint
UPDATE "audit_log" SET "before" = jsonb_build_object('state', 'active'),
    "after" = jsonb_build_object('state', 'revoked')
  WHERE "action" = 'gateway.revoked';--> statement-breakpoint
UPDATE "audit_log" SET "after" = "details" - 'siteId'
  WHERE "after" IS NULL AND "details" <> '{}'::jsonb
    AND "action" NOT IN ('interval.edited', 'month.closed', 'month.reopened', 'member.role_changed', 'member.removed');
