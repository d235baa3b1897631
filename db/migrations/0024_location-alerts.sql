CREATE TABLE "location_alerts" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"lab_id" uuid NOT NULL,
	"location_id" uuid NOT NULL,
	"recipient_id" uuid NOT NULL,
	"started_at" timestamp with time zone NOT NULL,
	"threshold_rh_percent" double precision NOT NULL,
	"peak_rh_percent" double precision NOT NULL,
	"duration_minutes" double precision NOT NULL,
	"delivery" text DEFAULT 'each' NOT NULL,
	"queued_at" timestamp with time zone DEFAULT now() NOT NULL,
	"attempts" integer DEFAULT 0 NOT NULL,
	"sent_at" timestamp with time zone,
	CONSTRAINT "location_alerts_delivery" CHECK ("location_alerts"."delivery" in ('each', 'digest'))
);
--> statement-breakpoint
ALTER TABLE "users" ADD COLUMN "collection_digest" boolean DEFAULT false NOT NULL;--> statement-breakpoint
ALTER TABLE "chambers" ADD COLUMN "alert_after_hours" double precision DEFAULT 6 NOT NULL;--> statement-breakpoint
ALTER TABLE "location_alerts" ADD CONSTRAINT "location_alerts_lab_id_labs_id_fk" FOREIGN KEY ("lab_id") REFERENCES "public"."labs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "location_alerts" ADD CONSTRAINT "location_alerts_location_id_chambers_id_fk" FOREIGN KEY ("location_id") REFERENCES "public"."chambers"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "location_alerts" ADD CONSTRAINT "location_alerts_recipient_id_users_id_fk" FOREIGN KEY ("recipient_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "location_alerts_once_idx" ON "location_alerts" USING btree ("location_id","started_at","recipient_id");--> statement-breakpoint
CREATE INDEX "location_alerts_unsent_idx" ON "location_alerts" USING btree ("sent_at","queued_at");