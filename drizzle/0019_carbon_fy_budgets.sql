CREATE TABLE "budgets" (
	"organization_id" uuid NOT NULL,
	"id" uuid DEFAULT gen_random_uuid() NOT NULL,
	"site_id" uuid NOT NULL,
	"carrier" "energy_carrier" NOT NULL,
	"financial_year" smallint NOT NULL,
	"energy_kwh" numeric(24, 6) NOT NULL,
	"amount" numeric(18, 2),
	"currency" text,
	"spread" text DEFAULT 'flat' NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "budgets_organization_id_id_pk" PRIMARY KEY("organization_id","id"),
	CONSTRAINT "budgets_spread_check" CHECK ("budgets"."spread" in ('flat', 'degree_days')),
	CONSTRAINT "budgets_amounts_check" CHECK ("budgets"."energy_kwh" >= 0 and coalesce("budgets"."amount", 0) >= 0)
);
--> statement-breakpoint
CREATE TABLE "carbon_adjustments" (
	"organization_id" uuid NOT NULL,
	"id" bigserial NOT NULL,
	"meter_id" uuid NOT NULL,
	"month" date NOT NULL,
	"delta_co2e_kg" numeric NOT NULL,
	"delta_co2e_market_kg" numeric NOT NULL,
	"reason" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "carbon_adjustments_organization_id_id_pk" PRIMARY KEY("organization_id","id")
);
--> statement-breakpoint
CREATE TABLE "carbon_targets" (
	"organization_id" uuid NOT NULL,
	"id" uuid DEFAULT gen_random_uuid() NOT NULL,
	"base_year" smallint NOT NULL,
	"target_year" smallint NOT NULL,
	"reduction_percent" numeric(5, 2) NOT NULL,
	"basis" text DEFAULT 'location' NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "carbon_targets_organization_id_id_pk" PRIMARY KEY("organization_id","id"),
	CONSTRAINT "carbon_targets_check" CHECK ("carbon_targets"."target_year" > "carbon_targets"."base_year" and "carbon_targets"."reduction_percent" > 0 and "carbon_targets"."reduction_percent" <= 100 and "carbon_targets"."basis" in ('location', 'market'))
);
--> statement-breakpoint
CREATE TABLE "emission_contracts" (
	"organization_id" uuid NOT NULL,
	"id" uuid DEFAULT gen_random_uuid() NOT NULL,
	"meter_id" uuid NOT NULL,
	"name" text NOT NULL,
	"kg_per_kwh" numeric(14, 8) NOT NULL,
	"valid_from" date NOT NULL,
	"valid_to" date,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "emission_contracts_organization_id_id_pk" PRIMARY KEY("organization_id","id"),
	CONSTRAINT "emission_contracts_factor_check" CHECK ("emission_contracts"."kg_per_kwh" >= 0)
);
--> statement-breakpoint
CREATE TABLE "emission_factor_sets" (
	"organization_id" uuid NOT NULL,
	"id" uuid DEFAULT gen_random_uuid() NOT NULL,
	"year" smallint NOT NULL,
	"carrier" "energy_carrier" NOT NULL,
	"scope" smallint NOT NULL,
	"location_kg_per_kwh" numeric(14, 8) NOT NULL,
	"market_kg_per_kwh" numeric(14, 8),
	"scope3_kg_per_kwh" numeric(14, 8),
	"source" text NOT NULL,
	"version" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "emission_factor_sets_organization_id_id_pk" PRIMARY KEY("organization_id","id"),
	CONSTRAINT "emission_factor_sets_scope_check" CHECK ("emission_factor_sets"."scope" in (1, 2)),
	CONSTRAINT "emission_factor_sets_source_check" CHECK (length(btrim("emission_factor_sets"."source")) > 0),
	CONSTRAINT "emission_factor_sets_factors_check" CHECK ("emission_factor_sets"."location_kg_per_kwh" >= 0 and coalesce("emission_factor_sets"."market_kg_per_kwh", 0) >= 0 and coalesce("emission_factor_sets"."scope3_kg_per_kwh", 0) >= 0)
);
--> statement-breakpoint
ALTER TABLE "reports" DROP CONSTRAINT "reports_period_kind_check";--> statement-breakpoint
ALTER TABLE "organizations" ADD COLUMN "financial_year_start_month" smallint DEFAULT 1 NOT NULL;--> statement-breakpoint
ALTER TABLE "budgets" ADD CONSTRAINT "budgets_organization_id_organizations_id_fk" FOREIGN KEY ("organization_id") REFERENCES "public"."organizations"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "budgets" ADD CONSTRAINT "budgets_site_fk" FOREIGN KEY ("organization_id","site_id") REFERENCES "public"."sites"("organization_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "carbon_targets" ADD CONSTRAINT "carbon_targets_organization_id_organizations_id_fk" FOREIGN KEY ("organization_id") REFERENCES "public"."organizations"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "emission_contracts" ADD CONSTRAINT "emission_contracts_organization_id_organizations_id_fk" FOREIGN KEY ("organization_id") REFERENCES "public"."organizations"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "emission_contracts" ADD CONSTRAINT "emission_contracts_meter_fk" FOREIGN KEY ("organization_id","meter_id") REFERENCES "public"."meters"("organization_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "emission_factor_sets" ADD CONSTRAINT "emission_factor_sets_organization_id_organizations_id_fk" FOREIGN KEY ("organization_id") REFERENCES "public"."organizations"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "budgets_site_carrier_year_unique" ON "budgets" USING btree ("organization_id","site_id","carrier","financial_year");--> statement-breakpoint
CREATE INDEX "carbon_adjustments_month_idx" ON "carbon_adjustments" USING btree ("organization_id","month");--> statement-breakpoint
CREATE UNIQUE INDEX "carbon_targets_org_unique" ON "carbon_targets" USING btree ("organization_id");--> statement-breakpoint
CREATE UNIQUE INDEX "emission_factor_sets_year_carrier_unique" ON "emission_factor_sets" USING btree ("organization_id","year","carrier");--> statement-breakpoint
ALTER TABLE "organizations" ADD CONSTRAINT "organizations_fy_start_check" CHECK ("organizations"."financial_year_start_month" between 1 and 12);--> statement-breakpoint
ALTER TABLE "reports" ADD CONSTRAINT "reports_period_kind_check" CHECK ("reports"."period_kind" in ('month', 'quarter', 'year', 'financial_year', 'financial_quarter'));