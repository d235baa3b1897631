DROP INDEX "specimens_lab_accession_idx";--> statement-breakpoint
CREATE UNIQUE INDEX "specimens_lab_accession_idx" ON "specimens" USING btree ("lab_id",lower("accession_number"));