-- Earlier audit events get the trial they belong to, so the audit trail can hide them from the
-- trial's blind scorers (lib/trials/access). Ids that are not UUIDs are left alone.
UPDATE "audit_events" SET "trial_id" = "entity_id"::uuid
  WHERE "entity" = 'trial' AND "entity_id" ~* '^[0-9a-f-]{36}$';--> statement-breakpoint
UPDATE "audit_events" SET "trial_id" = split_part("entity_id", ':', 1)::uuid
  WHERE "entity" = 'trial_member' AND split_part("entity_id", ':', 1) ~* '^[0-9a-f-]{36}$';--> statement-breakpoint
UPDATE "audit_events" a SET "trial_id" = p."trial_id" FROM "placements" p
  WHERE a."entity" = 'placement' AND a."trial_id" IS NULL AND p."id"::text = a."entity_id";--> statement-breakpoint
UPDATE "audit_events" a SET "trial_id" = s."trial_id" FROM "scores" s
  WHERE a."entity" = 'score' AND a."trial_id" IS NULL AND s."id"::text = a."entity_id";--> statement-breakpoint
UPDATE "audit_events" a SET "trial_id" = i."trial_id" FROM "inspections" i
  WHERE a."entity" = 'inspection' AND a."trial_id" IS NULL AND i."id"::text = a."entity_id";--> statement-breakpoint
UPDATE "audit_events" a SET "trial_id" = n."trial_id" FROM "trial_notes" n
  WHERE a."entity" = 'trial-note' AND a."trial_id" IS NULL AND n."id"::text = a."entity_id";--> statement-breakpoint
UPDATE "audit_events" a SET "trial_id" = ph."trial_id" FROM "photos" ph
  WHERE a."entity" IN ('photo', 'marks') AND a."trial_id" IS NULL AND ph."id"::text = a."entity_id";--> statement-breakpoint
UPDATE "audit_events" a SET "trial_id" = t."id" FROM "trials" t
  WHERE a."entity" = 'photo' AND a."trial_id" IS NULL AND t."id"::text = a."entity_id";
