ALTER TABLE "terrain_models" ADD COLUMN "ingest_job_id" text;--> statement-breakpoint
ALTER TABLE "terrain_models" ADD COLUMN "ingest_heartbeat_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "batch_run_items" ADD COLUMN "job_id" text;--> statement-breakpoint
ALTER TABLE "batch_run_items" ADD COLUMN "claim_token" uuid;--> statement-breakpoint
ALTER TABLE "batch_run_items" ADD COLUMN "heartbeat_at" timestamp with time zone;