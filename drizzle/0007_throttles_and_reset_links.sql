CREATE TYPE "public"."attempt_kind" AS ENUM('sign-in', 'sign-up', 'password-reset');--> statement-breakpoint
DROP INDEX "sign_in_attempts_email_idx";--> statement-breakpoint
DROP INDEX "sign_in_attempts_client_idx";--> statement-breakpoint
ALTER TABLE "password_reset_tokens" ADD COLUMN "ended_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "sign_in_attempts" ADD COLUMN "kind" "attempt_kind" DEFAULT 'sign-in' NOT NULL;--> statement-breakpoint
ALTER TABLE "sign_in_attempts" ADD COLUMN "device_hash" text;--> statement-breakpoint
-- Sign-ups were told apart by a "sign-up:" prefix on the address; they get their kind.
UPDATE "sign_in_attempts" SET "kind" = 'sign-up', "email" = substr("email", 9) WHERE "email" LIKE 'sign-up:%';--> statement-breakpoint
CREATE INDEX "sign_in_attempts_email_idx" ON "sign_in_attempts" USING btree ("kind","email","attempted_at");--> statement-breakpoint
CREATE INDEX "sign_in_attempts_client_idx" ON "sign_in_attempts" USING btree ("kind","client_address","attempted_at");