CREATE TABLE "ledger_adjustments" (
	"organization_id" uuid NOT NULL,
	"id" bigserial NOT NULL,
	"meter_id" uuid NOT NULL,
	"month" date NOT NULL,
	"delta_kwh" numeric(24, 6) NOT NULL,
	"source" text NOT NULL,
	"reason" text NOT NULL,
	"actor_user_id" text,
	"gateway_id" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "ledger_adjustments_organization_id_id_pk" PRIMARY KEY("organization_id","id")
);
--> statement-breakpoint
CREATE TABLE "month_closes" (
	"organization_id" uuid NOT NULL,
	"id" uuid DEFAULT gen_random_uuid() NOT NULL,
	"site_id" uuid,
	"month" date NOT NULL,
	"closed_by_user_id" text,
	"closed_at" timestamp with time zone DEFAULT now() NOT NULL,
	"reopened_at" timestamp with time zone,
	"reopened_by_user_id" text,
	"reopen_reason" text,
	CONSTRAINT "month_closes_organization_id_id_pk" PRIMARY KEY("organization_id","id")
);
--> statement-breakpoint
CREATE TABLE "monthly_rollups" (
	"organization_id" uuid NOT NULL,
	"meter_id" uuid NOT NULL,
	"month" date NOT NULL,
	"energy_kwh" numeric(24, 6) NOT NULL,
	"estimated_kwh" numeric(24, 6) NOT NULL,
	"hours" integer NOT NULL,
	"estimated_hours" integer NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "monthly_rollups_organization_id_meter_id_month_pk" PRIMARY KEY("organization_id","meter_id","month")
);
--> statement-breakpoint
ALTER TABLE "month_closes" ADD CONSTRAINT "month_closes_organization_id_organizations_id_fk" FOREIGN KEY ("organization_id") REFERENCES "public"."organizations"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "month_closes" ADD CONSTRAINT "month_closes_closed_by_user_id_users_id_fk" FOREIGN KEY ("closed_by_user_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "month_closes" ADD CONSTRAINT "month_closes_reopened_by_user_id_users_id_fk" FOREIGN KEY ("reopened_by_user_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "ledger_adjustments_month_idx" ON "ledger_adjustments" USING btree ("organization_id","month");--> statement-breakpoint
CREATE UNIQUE INDEX "month_closes_active_unique" ON "month_closes" USING btree ("organization_id",coalesce("site_id", '00000000-0000-0000-0000-000000000000'::uuid),"month") WHERE "month_closes"."reopened_at" is null;--> statement-breakpoint
-- Hand-written: foreign keys to meters, and rollups for intervals already stored.
ALTER TABLE "monthly_rollups" ADD CONSTRAINT "monthly_rollups_meter_fk" FOREIGN KEY ("organization_id","meter_id") REFERENCES "public"."meters"("organization_id","id") ON DELETE cascade;--> statement-breakpoint
ALTER TABLE "ledger_adjustments" ADD CONSTRAINT "ledger_adjustments_meter_fk" FOREIGN KEY ("organization_id","meter_id") REFERENCES "public"."meters"("organization_id","id") ON DELETE cascade;--> statement-breakpoint
INSERT INTO "monthly_rollups" ("organization_id", "meter_id", "month", "energy_kwh", "estimated_kwh", "hours", "estimated_hours")
SELECT i.organization_id, i.meter_id,
       date_trunc('month', i.hour_start AT TIME ZONE s.time_zone)::date,
       sum(i.energy_kwh),
       coalesce(sum(i.energy_kwh) FILTER (WHERE i.quality = 'estimated'), 0),
       count(*),
       count(*) FILTER (WHERE i.quality = 'estimated')
  FROM intervals i
  JOIN meters m ON m.organization_id = i.organization_id AND m.id = i.meter_id
  JOIN sites s ON s.organization_id = m.organization_id AND s.id = m.site_id
 GROUP BY 1, 2, 3;
