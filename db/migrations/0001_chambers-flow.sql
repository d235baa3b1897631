CREATE TABLE "desiccant_reminders" (
	"event_id" uuid NOT NULL,
	"user_id" uuid NOT NULL,
	"lab_id" uuid NOT NULL,
	"chamber_id" uuid NOT NULL,
	"exhaustion_at" timestamp with time zone NOT NULL,
	"queued_at" timestamp with time zone DEFAULT now() NOT NULL,
	"sent_at" timestamp with time zone,
	"attempts" integer DEFAULT 0 NOT NULL,
	CONSTRAINT "desiccant_reminders_event_id_user_id_pk" PRIMARY KEY("event_id","user_id")
);
--> statement-breakpoint
ALTER TABLE "hygrometer_checks" ADD COLUMN "chamber_id" uuid;--> statement-breakpoint
ALTER TABLE "hygrometer_checks" ADD COLUMN "notes" text DEFAULT '' NOT NULL;--> statement-breakpoint
ALTER TABLE "reading_imports" ADD COLUMN "instrument" text DEFAULT '' NOT NULL;--> statement-breakpoint
ALTER TABLE "desiccant_reminders" ADD CONSTRAINT "desiccant_reminders_event_id_desiccant_events_id_fk" FOREIGN KEY ("event_id") REFERENCES "public"."desiccant_events"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "desiccant_reminders" ADD CONSTRAINT "desiccant_reminders_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "desiccant_reminders" ADD CONSTRAINT "desiccant_reminders_lab_id_labs_id_fk" FOREIGN KEY ("lab_id") REFERENCES "public"."labs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "desiccant_reminders" ADD CONSTRAINT "desiccant_reminders_chamber_id_chambers_id_fk" FOREIGN KEY ("chamber_id") REFERENCES "public"."chambers"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "desiccant_reminders_unsent_idx" ON "desiccant_reminders" USING btree ("sent_at","queued_at");--> statement-breakpoint
ALTER TABLE "hygrometer_checks" ADD CONSTRAINT "hygrometer_checks_chamber_id_chambers_id_fk" FOREIGN KEY ("chamber_id") REFERENCES "public"."chambers"("id") ON DELETE restrict ON UPDATE no action;