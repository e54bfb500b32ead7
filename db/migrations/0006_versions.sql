CREATE TABLE "derivation_versions" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"derivation_id" uuid NOT NULL,
	"number" integer NOT NULL,
	"name" text NOT NULL,
	"created_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"state" "bytea" NOT NULL,
	"content_sha256" text NOT NULL,
	"body" jsonb NOT NULL,
	"checks" jsonb NOT NULL,
	"locked_at" timestamp with time zone,
	"locked_by" uuid,
	"report" text,
	"lock_sha256" text
);
--> statement-breakpoint
CREATE TABLE "share_links" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"version_id" uuid NOT NULL,
	"token_hash" text NOT NULL,
	"note" text DEFAULT '' NOT NULL,
	"created_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"expires_at" timestamp with time zone NOT NULL,
	"revoked_at" timestamp with time zone,
	"revoked_by" uuid
);
--> statement-breakpoint
ALTER TABLE "derivation_versions" ADD CONSTRAINT "derivation_versions_derivation_id_derivations_id_fk" FOREIGN KEY ("derivation_id") REFERENCES "public"."derivations"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "derivation_versions" ADD CONSTRAINT "derivation_versions_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "derivation_versions" ADD CONSTRAINT "derivation_versions_locked_by_users_id_fk" FOREIGN KEY ("locked_by") REFERENCES "public"."users"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "share_links" ADD CONSTRAINT "share_links_version_id_derivation_versions_id_fk" FOREIGN KEY ("version_id") REFERENCES "public"."derivation_versions"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "share_links" ADD CONSTRAINT "share_links_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "share_links" ADD CONSTRAINT "share_links_revoked_by_users_id_fk" FOREIGN KEY ("revoked_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "derivation_versions_number_idx" ON "derivation_versions" USING btree ("derivation_id","number");--> statement-breakpoint
CREATE UNIQUE INDEX "derivation_versions_locked_content_idx" ON "derivation_versions" USING btree ("derivation_id","content_sha256") WHERE "derivation_versions"."locked_at" is not null;--> statement-breakpoint
CREATE INDEX "derivation_versions_derivation_idx" ON "derivation_versions" USING btree ("derivation_id","created_at");--> statement-breakpoint
CREATE UNIQUE INDEX "share_links_token_idx" ON "share_links" USING btree ("token_hash");--> statement-breakpoint
CREATE INDEX "share_links_version_idx" ON "share_links" USING btree ("version_id","created_at");