-- Released protocol content is frozen: once a version is released (or superseded) its text,
-- schedule of visits, summary of changes and content hash never change, and it never goes back
-- to an earlier state. Investigators sign the hash; this keeps the hash true to the text.
CREATE OR REPLACE FUNCTION protocol_versions_released_frozen() RETURNS trigger AS $$
BEGIN
  IF OLD.state IN ('released', 'superseded') THEN
    IF NEW.content IS DISTINCT FROM OLD.content OR NEW.visit_schedule IS DISTINCT FROM OLD.visit_schedule
       OR NEW.summary_of_changes IS DISTINCT FROM OLD.summary_of_changes OR NEW.content_hash IS DISTINCT FROM OLD.content_hash
       OR NEW.version_label IS DISTINCT FROM OLD.version_label OR NEW.study_id IS DISTINCT FROM OLD.study_id THEN
      RAISE EXCEPTION 'protocol version % is %: its content is frozen', OLD.version_label, OLD.state USING ERRCODE = 'check_violation';
    END IF;
    IF NOT (NEW.state = OLD.state OR (OLD.state = 'released' AND NEW.state = 'superseded')) THEN
      RAISE EXCEPTION 'protocol version % cannot go from % to %', OLD.version_label, OLD.state, NEW.state USING ERRCODE = 'check_violation';
    END IF;
  END IF;
  RETURN NEW;
END;
$$ LANGUAGE plpgsql;
--> statement-breakpoint
CREATE TRIGGER protocol_versions_released_frozen BEFORE UPDATE ON protocol_versions
  FOR EACH ROW EXECUTE FUNCTION protocol_versions_released_frozen();
--> statement-breakpoint
-- A released version always carries its hash.
ALTER TABLE protocol_versions ADD CONSTRAINT protocol_versions_released_hash_check
  CHECK (state NOT IN ('released', 'superseded') OR content_hash IS NOT NULL);
