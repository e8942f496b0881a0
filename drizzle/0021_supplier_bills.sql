CREATE TABLE "bill_tolerances" (
	"organization_id" uuid NOT NULL,
	"percent" numeric,
	"absolute_kwh" numeric,
	"absolute_amount" numeric,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "bill_tolerances_organization_id_pk" PRIMARY KEY("organization_id")
);
--> statement-breakpoint
CREATE TABLE "supplier_bill_events" (
	"organization_id" uuid NOT NULL,
	"id" bigserial NOT NULL,
	"bill_id" uuid NOT NULL,
	"from_state" text,
	"to_state" text NOT NULL,
	"note" text DEFAULT '' NOT NULL,
	"actor_user_id" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "supplier_bill_events_organization_id_id_pk" PRIMARY KEY("organization_id","id")
);
--> statement-breakpoint
CREATE TABLE "supplier_bills" (
	"organization_id" uuid NOT NULL,
	"id" uuid DEFAULT gen_random_uuid() NOT NULL,
	"tariff_id" uuid NOT NULL,
	"supply_label" text NOT NULL,
	"period_from" date NOT NULL,
	"period_to" date NOT NULL,
	"kwh" numeric NOT NULL,
	"amount" numeric NOT NULL,
	"currency" text NOT NULL,
	"read_type" text NOT NULL,
	"metered_kwh" numeric NOT NULL,
	"computed_cost" numeric NOT NULL,
	"state" text NOT NULL,
	"note" text DEFAULT '' NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "supplier_bills_organization_id_id_pk" PRIMARY KEY("organization_id","id"),
	CONSTRAINT "supplier_bills_state_check" CHECK ("supplier_bills"."state" in ('agreed', 'queried', 'resolved')),
	CONSTRAINT "supplier_bills_read_type_check" CHECK ("supplier_bills"."read_type" in ('actual', 'estimated')),
	CONSTRAINT "supplier_bills_period_check" CHECK ("supplier_bills"."period_from" <= "supplier_bills"."period_to")
);
--> statement-breakpoint
ALTER TABLE "bill_tolerances" ADD CONSTRAINT "bill_tolerances_organization_id_organizations_id_fk" FOREIGN KEY ("organization_id") REFERENCES "public"."organizations"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "supplier_bill_events" ADD CONSTRAINT "supplier_bill_events_organization_id_bill_id_supplier_bills_organization_id_id_fk" FOREIGN KEY ("organization_id","bill_id") REFERENCES "public"."supplier_bills"("organization_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "supplier_bills" ADD CONSTRAINT "supplier_bills_organization_id_tariff_id_tariffs_organization_id_id_fk" FOREIGN KEY ("organization_id","tariff_id") REFERENCES "public"."tariffs"("organization_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "supplier_bill_events_bill_idx" ON "supplier_bill_events" USING btree ("organization_id","bill_id");--> statement-breakpoint
CREATE UNIQUE INDEX "supplier_bills_period_unique" ON "supplier_bills" USING btree ("organization_id","tariff_id","period_from","period_to");