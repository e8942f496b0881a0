CREATE TYPE "public"."meter_position" AS ENUM('boundary', 'internal');--> statement-breakpoint
ALTER TYPE "public"."energy_carrier" ADD VALUE 'natural_gas';--> statement-breakpoint
ALTER TYPE "public"."energy_carrier" ADD VALUE 'gas_oil';--> statement-breakpoint
ALTER TYPE "public"."energy_carrier" ADD VALUE 'kerosene';--> statement-breakpoint
ALTER TYPE "public"."energy_carrier" ADD VALUE 'lpg';--> statement-breakpoint
ALTER TYPE "public"."energy_carrier" ADD VALUE 'biomass';--> statement-breakpoint
ALTER TYPE "public"."energy_carrier" ADD VALUE 'hydrogen';--> statement-breakpoint
ALTER TYPE "public"."meter_quantity" ADD VALUE 'gas_volume';--> statement-breakpoint
ALTER TYPE "public"."meter_quantity" ADD VALUE 'liquid_fuel';--> statement-breakpoint
ALTER TYPE "public"."meter_quantity" ADD VALUE 'hydrogen';--> statement-breakpoint
ALTER TABLE "meters" ADD COLUMN "position" "meter_position" DEFAULT 'boundary' NOT NULL;