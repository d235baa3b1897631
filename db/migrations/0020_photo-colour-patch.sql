CREATE TABLE "photo_colour_patches" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"lab_id" uuid NOT NULL,
	"photo_id" uuid NOT NULL,
	"x" double precision NOT NULL,
	"y" double precision NOT NULL,
	"width" double precision NOT NULL,
	"height" double precision NOT NULL,
	"patch_lightness" double precision NOT NULL,
	"mean_linear" jsonb NOT NULL,
	"clipped_fraction" double precision NOT NULL,
	"pixels" integer NOT NULL,
	"marked_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "scores" ADD COLUMN "auto_estimate_colour" jsonb;--> statement-breakpoint
ALTER TABLE "photo_colour_patches" ADD CONSTRAINT "photo_colour_patches_lab_id_labs_id_fk" FOREIGN KEY ("lab_id") REFERENCES "public"."labs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "photo_colour_patches" ADD CONSTRAINT "photo_colour_patches_photo_id_photos_id_fk" FOREIGN KEY ("photo_id") REFERENCES "public"."photos"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "photo_colour_patches" ADD CONSTRAINT "photo_colour_patches_marked_by_users_id_fk" FOREIGN KEY ("marked_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "photo_colour_patches_photo_idx" ON "photo_colour_patches" USING btree ("photo_id");