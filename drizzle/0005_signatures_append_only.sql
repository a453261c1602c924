-- Electronic signatures are append-only (21 CFR Part 11 §11.10(e), §11.70): once signed, never changed or removed.
CREATE OR REPLACE FUNCTION electronic_signatures_append_only() RETURNS trigger AS $$
BEGIN
  RAISE EXCEPTION 'electronic_signatures is append-only: % is not allowed', TG_OP USING ERRCODE = 'insufficient_privilege';
END;
$$ LANGUAGE plpgsql;
--> statement-breakpoint
CREATE TRIGGER electronic_signatures_no_update BEFORE UPDATE OR DELETE ON electronic_signatures
  FOR EACH ROW EXECUTE FUNCTION electronic_signatures_append_only();
--> statement-breakpoint
CREATE TRIGGER electronic_signatures_no_truncate BEFORE TRUNCATE ON electronic_signatures
  FOR EACH STATEMENT EXECUTE FUNCTION electronic_signatures_append_only();
