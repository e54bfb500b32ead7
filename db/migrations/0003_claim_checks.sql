CREATE TYPE "public"."check_status" AS ENUM('holds', 'fails', 'inconclusive', 'invalid');--> statement-breakpoint
CREATE TABLE "claim_checks" (
	"derivation_id" uuid NOT NULL,
	"step_id" text NOT NULL,
	"claim_id" text NOT NULL,
	"kind" text NOT NULL,
	"flow_step_id" text,
	"status" "check_status" NOT NULL,
	"previous_status" "check_status",
	"status_since" timestamp with time zone DEFAULT now() NOT NULL,
	"input_hash" text NOT NULL,
	"result" jsonb NOT NULL,
	"checked_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "claim_checks_derivation_id_step_id_pk" PRIMARY KEY("derivation_id","step_id")
);
--> statement-breakpoint
ALTER TABLE "claim_checks" ADD CONSTRAINT "claim_checks_derivation_id_derivations_id_fk" FOREIGN KEY ("derivation_id") REFERENCES "public"."derivations"("id") ON DELETE cascade ON UPDATE no action;