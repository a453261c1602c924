-- A run's lines are frozen: amounts and keys never change, and lines are added or removed only
-- while the run is still prepared (before a second person approves it).
CREATE OR REPLACE FUNCTION payment_run_lines_frozen() RETURNS trigger AS $$
DECLARE run_state text;
BEGIN
  IF TG_OP = 'UPDATE' THEN
    IF NEW.amount_minor IS DISTINCT FROM OLD.amount_minor OR NEW.line_key IS DISTINCT FROM OLD.line_key
       OR NEW.run_id IS DISTINCT FROM OLD.run_id OR NEW.site_id IS DISTINCT FROM OLD.site_id
       OR NEW.currency IS DISTINCT FROM OLD.currency THEN
      RAISE EXCEPTION 'payment run lines are frozen: amount, key, run, site and currency cannot change' USING ERRCODE = 'check_violation';
    END IF;
    RETURN NEW;
  END IF;
  SELECT state INTO run_state FROM payment_runs WHERE id = COALESCE(NEW.run_id, OLD.run_id);
  IF run_state IS DISTINCT FROM 'prepared' THEN
    RAISE EXCEPTION 'payment run is %, its lines cannot be added or removed', run_state USING ERRCODE = 'check_violation';
  END IF;
  IF TG_OP = 'DELETE' THEN RETURN OLD; END IF;
  RETURN NEW;
END;
$$ LANGUAGE plpgsql;
--> statement-breakpoint
CREATE TRIGGER payment_run_lines_frozen BEFORE INSERT OR UPDATE OR DELETE ON payment_run_lines
  FOR EACH ROW EXECUTE FUNCTION payment_run_lines_frozen();
--> statement-breakpoint
-- The content hash an approver saw cannot change after approval either.
CREATE OR REPLACE FUNCTION payment_runs_hash_frozen() RETURNS trigger AS $$
BEGIN
  IF OLD.state <> 'prepared' AND (NEW.content_hash IS DISTINCT FROM OLD.content_hash OR NEW.line_count IS DISTINCT FROM OLD.line_count OR NEW.prepared_by IS DISTINCT FROM OLD.prepared_by) THEN
    RAISE EXCEPTION 'an approved payment run cannot change its content' USING ERRCODE = 'check_violation';
  END IF;
  RETURN NEW;
END;
$$ LANGUAGE plpgsql;
--> statement-breakpoint
CREATE TRIGGER payment_runs_hash_frozen BEFORE UPDATE ON payment_runs
  FOR EACH ROW EXECUTE FUNCTION payment_runs_hash_frozen();
