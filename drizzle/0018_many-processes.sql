CREATE TABLE "job_claims" (
	"job_id" uuid PRIMARY KEY NOT NULL,
	"queue" text NOT NULL,
	"data" jsonb NOT NULL,
	"host" text NOT NULL,
	"pid" integer NOT NULL,
	"started_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "rate_limit_hits" (
	"key" text PRIMARY KEY NOT NULL,
	"hits" integer NOT NULL,
	"resets_at" timestamp with time zone NOT NULL
);
--> statement-breakpoint
DROP INDEX "reports_pickup_idx";--> statement-breakpoint
CREATE INDEX "job_claims_process_idx" ON "job_claims" USING btree ("host","pid");--> statement-breakpoint
CREATE INDEX "reports_pickup_idx" ON "reports" USING btree ("status") WHERE "reports"."status" in ('queued', 'running');--> statement-breakpoint
ALTER TABLE "reports" DROP COLUMN "heartbeat_at";