ALTER TABLE "photos" ADD COLUMN "check_ack_note" text;--> statement-breakpoint
ALTER TABLE "photos" ADD COLUMN "check_ack_by" uuid;--> statement-breakpoint
ALTER TABLE "photos" ADD COLUMN "check_ack_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "photos" ADD CONSTRAINT "photos_check_ack_by_users_id_fk" FOREIGN KEY ("check_ack_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;