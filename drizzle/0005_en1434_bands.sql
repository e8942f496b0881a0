ALTER TABLE "intervals" ADD COLUMN "uncertainty_kwh" numeric(20, 6) DEFAULT '0' NOT NULL;--> statement-breakpoint
ALTER TABLE "meters" ADD COLUMN "accuracy_class" integer;--> statement-breakpoint
ALTER TABLE "meters" ADD COLUMN "delta_theta_min_k" numeric(5, 2);--> statement-breakpoint
ALTER TABLE "meters" ADD COLUMN "qp_m3_per_h" numeric(10, 3);--> statement-breakpoint
ALTER TABLE "monthly_rollups" ADD COLUMN "uncertainty_kwh" numeric(24, 6) DEFAULT '0' NOT NULL;--> statement-breakpoint
ALTER TABLE "raw_readings" ADD COLUMN "uncertainty_kwh" numeric(20, 6);