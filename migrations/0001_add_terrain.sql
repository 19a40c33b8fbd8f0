CREATE TYPE "public"."terrain_data_type" AS ENUM('Int16', 'Int32', 'Float32', 'Float64');--> statement-breakpoint
CREATE TYPE "public"."terrain_status" AS ENUM('processing', 'ready', 'failed');--> statement-breakpoint
CREATE TABLE "terrain_dependents" (
	"terrain_id" uuid NOT NULL,
	"kind" text NOT NULL,
	"dependent_id" uuid NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "terrain_dependents_terrain_id_kind_dependent_id_pk" PRIMARY KEY("terrain_id","kind","dependent_id")
);
--> statement-breakpoint
CREATE TABLE "terrain_models" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"name" text NOT NULL,
	"status" "terrain_status" DEFAULT 'processing' NOT NULL,
	"failure_reason" text,
	"original_file_name" text NOT NULL,
	"stored_path" text NOT NULL,
	"sha256" text NOT NULL,
	"file_size_bytes" bigint NOT NULL,
	"crs" text NOT NULL,
	"crs_name" text,
	"proj4_definition" text NOT NULL,
	"width_px" integer NOT NULL,
	"height_px" integer NOT NULL,
	"block_width_px" integer NOT NULL,
	"block_height_px" integer NOT NULL,
	"origin_x" double precision NOT NULL,
	"origin_y" double precision NOT NULL,
	"pixel_size_x" double precision NOT NULL,
	"pixel_size_y" double precision NOT NULL,
	"resolution_m" double precision NOT NULL,
	"data_type" "terrain_data_type" NOT NULL,
	"nodata" double precision,
	"pixel_type" text NOT NULL,
	"vertical_unit" text NOT NULL,
	"vertical_scale_to_m" double precision DEFAULT 1 NOT NULL,
	"min_elevation_m" double precision,
	"max_elevation_m" double precision,
	"nodata_share" double precision,
	"spike_count" integer,
	"quality_notes" jsonb DEFAULT '[]'::jsonb NOT NULL,
	"overviews" jsonb DEFAULT '[]'::jsonb NOT NULL,
	"footprint" geometry(Polygon,4326),
	"uploaded_by_id" uuid,
	"ready_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "terrain_models_size_check" CHECK ("terrain_models"."width_px" > 0 and "terrain_models"."height_px" > 0)
);
--> statement-breakpoint
ALTER TABLE "terrain_dependents" ADD CONSTRAINT "terrain_dependents_terrain_id_terrain_models_id_fk" FOREIGN KEY ("terrain_id") REFERENCES "public"."terrain_models"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "terrain_models" ADD CONSTRAINT "terrain_models_uploaded_by_id_users_id_fk" FOREIGN KEY ("uploaded_by_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "terrain_models_sha256_key" ON "terrain_models" USING btree ("sha256");--> statement-breakpoint
CREATE INDEX "terrain_models_status_idx" ON "terrain_models" USING btree ("status");--> statement-breakpoint
CREATE INDEX "terrain_models_footprint_idx" ON "terrain_models" USING gist ("footprint");