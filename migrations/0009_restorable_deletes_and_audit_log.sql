CREATE TABLE "audit_log" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"at" timestamp with time zone DEFAULT now() NOT NULL,
	"actor_id" uuid,
	"actor_name" text NOT NULL,
	"action" text NOT NULL,
	"entity_kind" text NOT NULL,
	"entity_id" uuid NOT NULL,
	"entity_name" text NOT NULL,
	"details" jsonb DEFAULT '{}'::jsonb NOT NULL
);
--> statement-breakpoint
ALTER TABLE "terrain_models" ADD COLUMN "deleted_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "terrain_models" ADD COLUMN "deleted_by_id" uuid;--> statement-breakpoint
ALTER TABLE "terrain_models" ADD COLUMN "deleted_by_name" text;--> statement-breakpoint
ALTER TABLE "road_routes" ADD COLUMN "deleted_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "road_routes" ADD COLUMN "deleted_by_id" uuid;--> statement-breakpoint
ALTER TABLE "road_routes" ADD COLUMN "deleted_by_name" text;--> statement-breakpoint
ALTER TABLE "vehicle_profiles" ADD COLUMN "deleted_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "vehicle_profiles" ADD COLUMN "deleted_by_id" uuid;--> statement-breakpoint
ALTER TABLE "vehicle_profiles" ADD COLUMN "deleted_by_name" text;--> statement-breakpoint
ALTER TABLE "scenarios" ADD COLUMN "deleted_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "scenarios" ADD COLUMN "deleted_by_id" uuid;--> statement-breakpoint
ALTER TABLE "scenarios" ADD COLUMN "deleted_by_name" text;--> statement-breakpoint
CREATE INDEX "audit_log_at_idx" ON "audit_log" USING btree ("at");--> statement-breakpoint
CREATE INDEX "audit_log_entity_idx" ON "audit_log" USING btree ("entity_kind","entity_id");