CREATE TYPE "public"."basemap_import_status" AS ENUM('queued', 'importing', 'ready', 'failed');--> statement-breakpoint
CREATE TABLE "basemap_imports" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"status" "basemap_import_status" DEFAULT 'queued' NOT NULL,
	"is_active" boolean DEFAULT false NOT NULL,
	"original_file_name" text NOT NULL,
	"stored_path" text,
	"file_size_bytes" bigint NOT NULL,
	"file_format" text NOT NULL,
	"attribution" text NOT NULL,
	"schema_name" text NOT NULL,
	"progress" jsonb,
	"failure_reason" text,
	"bbox_west" double precision,
	"bbox_south" double precision,
	"bbox_east" double precision,
	"bbox_north" double precision,
	"road_count" integer,
	"place_count" integer,
	"water_count" integer,
	"landuse_count" integer,
	"graph_edge_count" integer,
	"uploaded_by_id" uuid,
	"started_at" timestamp with time zone,
	"finished_at" timestamp with time zone,
	"activated_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "road_graph_overlay_edges" (
	"id" bigint PRIMARY KEY GENERATED ALWAYS AS IDENTITY (sequence name "road_graph_overlay_edges_id_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 9223372036854775807 START WITH 1099511627776 CACHE 1),
	"base_import_id" uuid,
	"kind" text NOT NULL,
	"replaces_edge_id" bigint,
	"source" bigint NOT NULL,
	"target" bigint NOT NULL,
	"cost" double precision NOT NULL,
	"reverse_cost" double precision NOT NULL,
	"length_m" double precision NOT NULL,
	"name" text,
	"elevation_start_m" double precision,
	"elevation_end_m" double precision,
	"ascent_m" double precision,
	"descent_m" double precision,
	"geometry" geometry(LineString,4326) NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "basemap_imports" ADD CONSTRAINT "basemap_imports_uploaded_by_id_users_id_fk" FOREIGN KEY ("uploaded_by_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "road_graph_overlay_edges" ADD CONSTRAINT "road_graph_overlay_edges_base_import_id_basemap_imports_id_fk" FOREIGN KEY ("base_import_id") REFERENCES "public"."basemap_imports"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "basemap_imports_one_active_idx" ON "basemap_imports" USING btree ("is_active") WHERE "basemap_imports"."is_active";--> statement-breakpoint
CREATE UNIQUE INDEX "basemap_imports_schema_name_idx" ON "basemap_imports" USING btree ("schema_name");--> statement-breakpoint
CREATE INDEX "road_graph_overlay_edges_geometry_idx" ON "road_graph_overlay_edges" USING gist ("geometry");--> statement-breakpoint
CREATE INDEX "road_graph_overlay_edges_base_idx" ON "road_graph_overlay_edges" USING btree ("base_import_id","replaces_edge_id");