CREATE TYPE "public"."remark_entry_kind" AS ENUM('remark', 'resolved', 'reopened');--> statement-breakpoint
CREATE TABLE "claim_turn_notices" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"derivation_id" uuid NOT NULL,
	"step_id" text NOT NULL,
	"claim_id" text NOT NULL,
	"kind" text NOT NULL,
	"message" text DEFAULT '' NOT NULL,
	"edited_by" uuid[] DEFAULT '{}'::uuid[] NOT NULL,
	"turned_at" timestamp with time zone DEFAULT now() NOT NULL,
	"mailed_at" timestamp with time zone
);
--> statement-breakpoint
CREATE TABLE "remark_entries" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"thread_id" uuid NOT NULL,
	"kind" "remark_entry_kind" NOT NULL,
	"author_id" uuid,
	"body" text DEFAULT '' NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "remark_threads" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"derivation_id" uuid NOT NULL,
	"step_id" text NOT NULL,
	"step_excerpt" text DEFAULT '' NOT NULL,
	"created_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"resolved_at" timestamp with time zone,
	"resolved_by" uuid
);
--> statement-breakpoint
CREATE TABLE "sign_offs" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"derivation_id" uuid NOT NULL,
	"step_id" text NOT NULL,
	"user_id" uuid,
	"signed_at" timestamp with time zone DEFAULT now() NOT NULL,
	"content_hash" text NOT NULL,
	"dependency_step_id" text,
	"dependency_hash" text,
	"cleared_at" timestamp with time zone,
	"cleared_reason" text,
	"cleared_by" uuid
);
--> statement-breakpoint
CREATE TABLE "step_authors" (
	"derivation_id" uuid NOT NULL,
	"step_id" text NOT NULL,
	"user_id" uuid NOT NULL,
	"first_edit_at" timestamp with time zone DEFAULT now() NOT NULL,
	"last_edit_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "step_authors_derivation_id_step_id_user_id_pk" PRIMARY KEY("derivation_id","step_id","user_id")
);
--> statement-breakpoint
ALTER TABLE "claim_turn_notices" ADD CONSTRAINT "claim_turn_notices_derivation_id_derivations_id_fk" FOREIGN KEY ("derivation_id") REFERENCES "public"."derivations"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "remark_entries" ADD CONSTRAINT "remark_entries_thread_id_remark_threads_id_fk" FOREIGN KEY ("thread_id") REFERENCES "public"."remark_threads"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "remark_entries" ADD CONSTRAINT "remark_entries_author_id_users_id_fk" FOREIGN KEY ("author_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "remark_threads" ADD CONSTRAINT "remark_threads_derivation_id_derivations_id_fk" FOREIGN KEY ("derivation_id") REFERENCES "public"."derivations"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "remark_threads" ADD CONSTRAINT "remark_threads_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "remark_threads" ADD CONSTRAINT "remark_threads_resolved_by_users_id_fk" FOREIGN KEY ("resolved_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sign_offs" ADD CONSTRAINT "sign_offs_derivation_id_derivations_id_fk" FOREIGN KEY ("derivation_id") REFERENCES "public"."derivations"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sign_offs" ADD CONSTRAINT "sign_offs_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sign_offs" ADD CONSTRAINT "sign_offs_cleared_by_users_id_fk" FOREIGN KEY ("cleared_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "step_authors" ADD CONSTRAINT "step_authors_derivation_id_derivations_id_fk" FOREIGN KEY ("derivation_id") REFERENCES "public"."derivations"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "step_authors" ADD CONSTRAINT "step_authors_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "claim_turn_notices_pending_idx" ON "claim_turn_notices" USING btree ("derivation_id") WHERE "claim_turn_notices"."mailed_at" is null;--> statement-breakpoint
CREATE INDEX "remark_entries_thread_idx" ON "remark_entries" USING btree ("thread_id","created_at");--> statement-breakpoint
CREATE INDEX "remark_threads_derivation_idx" ON "remark_threads" USING btree ("derivation_id","step_id");--> statement-breakpoint
CREATE INDEX "sign_offs_derivation_idx" ON "sign_offs" USING btree ("derivation_id","step_id");--> statement-breakpoint
CREATE UNIQUE INDEX "sign_offs_standing_idx" ON "sign_offs" USING btree ("derivation_id","step_id","user_id") WHERE "sign_offs"."cleared_at" is null;