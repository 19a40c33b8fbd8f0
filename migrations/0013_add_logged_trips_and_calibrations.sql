CREATE TABLE "vehicle_profile_versions" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"vehicle_profile_id" uuid NOT NULL,
	"version" integer NOT NULL,
	"content" jsonb NOT NULL,
	"source" text NOT NULL,
	"calibration_id" uuid,
	"logged_trips" jsonb DEFAULT '[]'::jsonb NOT NULL,
	"created_by_id" uuid,
	"created_by_name" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "calibrations" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"vehicle_profile_id" uuid NOT NULL,
	"profile_version" integer NOT NULL,
	"status" text DEFAULT 'queued' NOT NULL,
	"failure_reason" text,
	"logged_trips" jsonb NOT NULL,
	"parameters" jsonb NOT NULL,
	"result" jsonb,
	"decision" text,
	"decided_at" timestamp with time zone,
	"decided_by_name" text,
	"accepted_version" integer,
	"rerun_batch_id" uuid,
	"created_by_id" uuid,
	"created_by_name" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"started_at" timestamp with time zone,
	"finished_at" timestamp with time zone
);
--> statement-breakpoint
CREATE TABLE "logged_trips" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"vehicle_profile_id" uuid NOT NULL,
	"name" text NOT NULL,
	"file_name" text NOT NULL,
	"started_at" timestamp with time zone,
	"samples" integer NOT NULL,
	"duration_s" double precision NOT NULL,
	"length_m" double precision NOT NULL,
	"route_id" uuid,
	"route_version" integer,
	"route_name" text NOT NULL,
	"route_created" text NOT NULL,
	"direction" text NOT NULL,
	"from_m" double precision NOT NULL,
	"to_m" double precision NOT NULL,
	"payload_kg" double precision,
	"payload_source" text NOT NULL,
	"ambient_c" double precision,
	"elevation_source" text NOT NULL,
	"start_soc" double precision,
	"channels" jsonb NOT NULL,
	"columns" jsonb NOT NULL,
	"ignored_columns" jsonb NOT NULL,
	"gps" jsonb NOT NULL,
	"alignment" jsonb NOT NULL,
	"uploaded_by_id" uuid,
	"uploaded_by_name" text NOT NULL,
	"seed_key" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "logged_trips_seedKey_unique" UNIQUE("seed_key")
);
--> statement-breakpoint
ALTER TABLE "vehicle_profiles" ADD COLUMN "version" integer DEFAULT 1 NOT NULL;--> statement-breakpoint
ALTER TABLE "vehicle_profiles" ADD COLUMN "calibration" jsonb;--> statement-breakpoint
ALTER TABLE "batch_runs" ADD COLUMN "reason" text;--> statement-breakpoint
ALTER TABLE "vehicle_profile_versions" ADD CONSTRAINT "vehicle_profile_versions_vehicle_profile_id_vehicle_profiles_id_fk" FOREIGN KEY ("vehicle_profile_id") REFERENCES "public"."vehicle_profiles"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "vehicle_profile_versions" ADD CONSTRAINT "vehicle_profile_versions_created_by_id_users_id_fk" FOREIGN KEY ("created_by_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "calibrations" ADD CONSTRAINT "calibrations_vehicle_profile_id_vehicle_profiles_id_fk" FOREIGN KEY ("vehicle_profile_id") REFERENCES "public"."vehicle_profiles"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "calibrations" ADD CONSTRAINT "calibrations_created_by_id_users_id_fk" FOREIGN KEY ("created_by_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "logged_trips" ADD CONSTRAINT "logged_trips_vehicle_profile_id_vehicle_profiles_id_fk" FOREIGN KEY ("vehicle_profile_id") REFERENCES "public"."vehicle_profiles"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "logged_trips" ADD CONSTRAINT "logged_trips_route_id_road_routes_id_fk" FOREIGN KEY ("route_id") REFERENCES "public"."road_routes"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "logged_trips" ADD CONSTRAINT "logged_trips_uploaded_by_id_users_id_fk" FOREIGN KEY ("uploaded_by_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "vehicle_profile_versions_profile_version_key" ON "vehicle_profile_versions" USING btree ("vehicle_profile_id","version");--> statement-breakpoint
CREATE INDEX "calibrations_vehicle_profile_id_idx" ON "calibrations" USING btree ("vehicle_profile_id");--> statement-breakpoint
CREATE INDEX "logged_trips_vehicle_profile_id_idx" ON "logged_trips" USING btree ("vehicle_profile_id");