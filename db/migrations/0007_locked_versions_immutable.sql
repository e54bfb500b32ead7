-- A locked version never changes: the database itself refuses any UPDATE or DELETE of a row once
-- locked_at is set, whoever asks. A locked row must carry its report and hash.
ALTER TABLE "derivation_versions" ADD CONSTRAINT "derivation_versions_lock_complete" CHECK (
	"locked_at" IS NULL OR ("locked_by" IS NOT NULL AND "report" IS NOT NULL AND "lock_sha256" IS NOT NULL)
);--> statement-breakpoint
CREATE FUNCTION "refuse_locked_version_change"() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
	RAISE EXCEPTION 'version % of derivation % is locked and cannot be changed', OLD."number", OLD."derivation_id"
		USING ERRCODE = 'P0409';
END;
$$;--> statement-breakpoint
CREATE TRIGGER "derivation_versions_locked_immutable"
	BEFORE UPDATE OR DELETE ON "derivation_versions"
	FOR EACH ROW WHEN (OLD."locked_at" IS NOT NULL)
	EXECUTE FUNCTION "refuse_locked_version_change"();
