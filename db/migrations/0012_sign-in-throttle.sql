CREATE TABLE "sign_in_throttles" (
	"key" text PRIMARY KEY NOT NULL,
	"failures" integer NOT NULL,
	"last_failure_at" timestamp with time zone NOT NULL,
	"wait_until" timestamp with time zone
);
--> statement-breakpoint
ALTER TABLE "users" DROP COLUMN "failed_sign_ins";--> statement-breakpoint
ALTER TABLE "users" DROP COLUMN "locked_until";