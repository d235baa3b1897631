ALTER TABLE "reading_blocks" ADD COLUMN "width_hours" smallint DEFAULT 1 NOT NULL;--> statement-breakpoint
ALTER TABLE "reading_blocks" ADD COLUMN "max_span_ms" double precision DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE "reading_blocks" DROP CONSTRAINT "reading_blocks_lab_id_chamber_id_block_start_instrument_pk";--> statement-breakpoint
ALTER TABLE "reading_blocks" ADD CONSTRAINT "reading_blocks_lab_id_chamber_id_width_hours_block_start_instrument_pk" PRIMARY KEY("lab_id","chamber_id","width_hours","block_start","instrument");
