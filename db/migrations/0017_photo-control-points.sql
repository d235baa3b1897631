CREATE TABLE "photo_control_points" (
	"photo_id" uuid PRIMARY KEY NOT NULL,
	"lab_id" uuid NOT NULL,
	"reference_photo_id" uuid NOT NULL,
	"points" jsonb NOT NULL,
	"updated_by" uuid,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "photo_control_points" ADD CONSTRAINT "photo_control_points_photo_id_photos_id_fk" FOREIGN KEY ("photo_id") REFERENCES "public"."photos"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "photo_control_points" ADD CONSTRAINT "photo_control_points_lab_id_labs_id_fk" FOREIGN KEY ("lab_id") REFERENCES "public"."labs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "photo_control_points" ADD CONSTRAINT "photo_control_points_reference_photo_id_photos_id_fk" FOREIGN KEY ("reference_photo_id") REFERENCES "public"."photos"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "photo_control_points" ADD CONSTRAINT "photo_control_points_updated_by_users_id_fk" FOREIGN KEY ("updated_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "photo_control_points_lab_ref_idx" ON "photo_control_points" USING btree ("lab_id","reference_photo_id");