CREATE TABLE "reading_blocks" (
	"lab_id" uuid NOT NULL,
	"chamber_id" uuid NOT NULL,
	"block_start" timestamp with time zone NOT NULL,
	"instrument" text NOT NULL,
	"n" integer NOT NULL,
	"first_at" timestamp with time zone NOT NULL,
	"last_at" timestamp with time zone NOT NULL,
	"last_rh_percent" double precision NOT NULL,
	"min_rh_percent" double precision NOT NULL,
	"min_at" timestamp with time zone NOT NULL,
	"min_temp_c" double precision,
	"min_dew_point_c" double precision,
	"max_rh_percent" double precision NOT NULL,
	"max_at" timestamp with time zone NOT NULL,
	"max_temp_c" double precision,
	"max_dew_point_c" double precision,
	"span_ms" double precision NOT NULL,
	"span_rh_ms" double precision NOT NULL,
	CONSTRAINT "reading_blocks_lab_id_chamber_id_block_start_instrument_pk" PRIMARY KEY("lab_id","chamber_id","block_start","instrument")
);
--> statement-breakpoint
ALTER TABLE "reading_blocks" ADD CONSTRAINT "reading_blocks_lab_id_labs_id_fk" FOREIGN KEY ("lab_id") REFERENCES "public"."labs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "reading_blocks" ADD CONSTRAINT "reading_blocks_chamber_id_chambers_id_fk" FOREIGN KEY ("chamber_id") REFERENCES "public"."chambers"("id") ON DELETE cascade ON UPDATE no action;