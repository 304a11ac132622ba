-- groove_versions is append-only: a saved version's content never changes. Only the foreign keys that
-- PostgreSQL itself sets to NULL when a user or a parent row disappears (author_id, parent_version_id) may change.
CREATE FUNCTION "groove_versions_reject_change"() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  IF NEW.id IS DISTINCT FROM OLD.id
     OR NEW.groove_id IS DISTINCT FROM OLD.groove_id
     OR NEW.number IS DISTINCT FROM OLD.number
     OR NEW.document IS DISTINCT FROM OLD.document
     OR NEW.content_hash IS DISTINCT FROM OLD.content_hash
     OR NEW.message IS DISTINCT FROM OLD.message
     OR NEW.created_at IS DISTINCT FROM OLD.created_at
     OR (NEW.author_id IS DISTINCT FROM OLD.author_id AND NEW.author_id IS NOT NULL)
     OR (NEW.parent_version_id IS DISTINCT FROM OLD.parent_version_id AND NEW.parent_version_id IS NOT NULL) THEN
    RAISE EXCEPTION 'groove_versions is append-only: a saved version cannot be changed' USING ERRCODE = 'insufficient_privilege';
  END IF;
  RETURN NEW;
END;
$$;--> statement-breakpoint
CREATE TRIGGER "groove_versions_immutable"
  BEFORE UPDATE ON "groove_versions"
  FOR EACH ROW EXECUTE FUNCTION "groove_versions_reject_change"();
