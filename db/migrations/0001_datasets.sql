CREATE TYPE "public"."column_role" AS ENUM('x', 'y', 'sigma', 'other');--> statement-breakpoint
CREATE TYPE "public"."dataset_format" AS ENUM('csv', 'tsv');--> statement-breakpoint
CREATE TABLE "dataset_columns" (
	"dataset_id" uuid NOT NULL,
	"position" integer NOT NULL,
	"header" text NOT NULL,
	"role" "column_role" NOT NULL,
	"quantity" text DEFAULT '' NOT NULL,
	"unit" text DEFAULT '' NOT NULL,
	"numeric" boolean NOT NULL,
	"values" jsonb NOT NULL,
	CONSTRAINT "dataset_columns_dataset_id_position_pk" PRIMARY KEY("dataset_id","position")
);
--> statement-breakpoint
CREATE TABLE "datasets" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"group_id" uuid NOT NULL,
	"name" text NOT NULL,
	"description" text DEFAULT '' NOT NULL,
	"file_name" text NOT NULL,
	"format" "dataset_format" NOT NULL,
	"file_text" text NOT NULL,
	"file_bytes" integer NOT NULL,
	"file_sha256" text NOT NULL,
	"row_count" integer NOT NULL,
	"uploaded_by" uuid,
	"uploaded_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "dataset_columns" ADD CONSTRAINT "dataset_columns_dataset_id_datasets_id_fk" FOREIGN KEY ("dataset_id") REFERENCES "public"."datasets"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "datasets" ADD CONSTRAINT "datasets_group_id_groups_id_fk" FOREIGN KEY ("group_id") REFERENCES "public"."groups"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "datasets" ADD CONSTRAINT "datasets_uploaded_by_users_id_fk" FOREIGN KEY ("uploaded_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "datasets_group_idx" ON "datasets" USING btree ("group_id","uploaded_at");--> statement-breakpoint
CREATE UNIQUE INDEX "datasets_group_name_idx" ON "datasets" USING btree ("group_id",lower("name"));