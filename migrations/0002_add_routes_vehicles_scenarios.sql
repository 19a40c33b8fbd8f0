CREATE TABLE "road_network_lines" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"feature_index" integer NOT NULL,
	"part_index" integer DEFAULT 0 NOT NULL,
	"properties" jsonb DEFAULT '{}'::jsonb NOT NULL,
	"geometry" geometry(LineString,4326) NOT NULL,
	"coordinates" jsonb NOT NULL,
	"uploaded_by_id" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "road_route_versions" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"route_id" uuid NOT NULL,
	"version" integer NOT NULL,
	"name" text NOT NULL,
	"description" text DEFAULT '' NOT NULL,
	"mode" text NOT NULL,
	"geometry" geometry(LineString,4326) NOT NULL,
	"coordinates" jsonb NOT NULL,
	"stops" jsonb NOT NULL,
	"speed_limits" jsonb NOT NULL,
	"default_speed_limit_kph" double precision NOT NULL,
	"trips_per_day" double precision NOT NULL,
	"service_days_per_year" integer NOT NULL,
	"length_m" double precision NOT NULL,
	"created_by_id" uuid,
	"created_by_name" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "road_route_versions_version_check" CHECK ("road_route_versions"."version" >= 1)
);
--> statement-breakpoint
CREATE TABLE "road_routes" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"current_version" integer DEFAULT 1 NOT NULL,
	"seed_key" text,
	"created_by_id" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "road_routes_seedKey_unique" UNIQUE("seed_key")
);
--> statement-breakpoint
CREATE TABLE "vehicle_profiles" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"name" text NOT NULL,
	"description" text DEFAULT '' NOT NULL,
	"vehicle_class" text NOT NULL,
	"vehicle" jsonb NOT NULL,
	"loads_kg" jsonb NOT NULL,
	"passenger_mass_kg" double precision NOT NULL,
	"seasons" jsonb NOT NULL,
	"is_preset" boolean DEFAULT false NOT NULL,
	"seed_key" text,
	"created_by_id" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "vehicle_profiles_seedKey_unique" UNIQUE("seed_key")
);
--> statement-breakpoint
CREATE TABLE "scenarios" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"name" text NOT NULL,
	"route_id" uuid NOT NULL,
	"route_version" integer NOT NULL,
	"route_version_pinned" boolean DEFAULT false NOT NULL,
	"direction" text NOT NULL,
	"vehicle_profile_id" uuid NOT NULL,
	"load" jsonb NOT NULL,
	"season" jsonb NOT NULL,
	"start_soc" double precision NOT NULL,
	"options" jsonb NOT NULL,
	"in_service" boolean DEFAULT false NOT NULL,
	"status" text DEFAULT 'queued' NOT NULL,
	"failure_reason" text,
	"engine_version" text,
	"computed_at" timestamp with time zone,
	"inputs" jsonb,
	"summary" jsonb,
	"risk_counts" jsonb,
	"direction_results" jsonb,
	"seed_key" text,
	"created_by_id" uuid,
	"created_by_name" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "scenarios_seedKey_unique" UNIQUE("seed_key")
);
--> statement-breakpoint
ALTER TABLE "road_network_lines" ADD CONSTRAINT "road_network_lines_uploaded_by_id_users_id_fk" FOREIGN KEY ("uploaded_by_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "road_route_versions" ADD CONSTRAINT "road_route_versions_route_id_road_routes_id_fk" FOREIGN KEY ("route_id") REFERENCES "public"."road_routes"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "road_route_versions" ADD CONSTRAINT "road_route_versions_created_by_id_users_id_fk" FOREIGN KEY ("created_by_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "road_routes" ADD CONSTRAINT "road_routes_created_by_id_users_id_fk" FOREIGN KEY ("created_by_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "vehicle_profiles" ADD CONSTRAINT "vehicle_profiles_created_by_id_users_id_fk" FOREIGN KEY ("created_by_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "scenarios" ADD CONSTRAINT "scenarios_route_id_road_routes_id_fk" FOREIGN KEY ("route_id") REFERENCES "public"."road_routes"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "scenarios" ADD CONSTRAINT "scenarios_vehicle_profile_id_vehicle_profiles_id_fk" FOREIGN KEY ("vehicle_profile_id") REFERENCES "public"."vehicle_profiles"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "scenarios" ADD CONSTRAINT "scenarios_created_by_id_users_id_fk" FOREIGN KEY ("created_by_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "road_network_lines_geometry_idx" ON "road_network_lines" USING gist ("geometry");--> statement-breakpoint
CREATE UNIQUE INDEX "road_route_versions_route_id_version_key" ON "road_route_versions" USING btree ("route_id","version");--> statement-breakpoint
CREATE INDEX "road_route_versions_geometry_idx" ON "road_route_versions" USING gist ("geometry");--> statement-breakpoint
CREATE INDEX "scenarios_route_id_idx" ON "scenarios" USING btree ("route_id");--> statement-breakpoint
CREATE INDEX "scenarios_vehicle_profile_id_idx" ON "scenarios" USING btree ("vehicle_profile_id");