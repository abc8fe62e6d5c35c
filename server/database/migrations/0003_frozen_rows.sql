-- Signed material never changes: frozen versions and signatures refuse UPDATE and DELETE.
CREATE TRIGGER entry_versions_frozen BEFORE UPDATE OR DELETE ON entry_versions
  FOR EACH ROW EXECUTE FUNCTION thermotome_refuse_change();
--> statement-breakpoint
CREATE TRIGGER entry_versions_no_truncate BEFORE TRUNCATE ON entry_versions
  FOR EACH STATEMENT EXECUTE FUNCTION thermotome_refuse_change();
--> statement-breakpoint
CREATE TRIGGER signatures_frozen BEFORE UPDATE OR DELETE ON signatures
  FOR EACH ROW EXECUTE FUNCTION thermotome_refuse_change();
--> statement-breakpoint
CREATE TRIGGER signatures_no_truncate BEFORE TRUNCATE ON signatures
  FOR EACH STATEMENT EXECUTE FUNCTION thermotome_refuse_change();
--> statement-breakpoint
-- Public keys are kept forever. The only change allowed is retiring an active key once.
CREATE OR REPLACE FUNCTION thermotome_signing_key_guard() RETURNS trigger AS $$
BEGIN
  IF TG_OP = 'DELETE' THEN
    RAISE EXCEPTION 'signing_keys are kept forever: DELETE refused' USING ERRCODE = 'insufficient_privilege';
  END IF;
  IF OLD.retired_at IS NOT NULL
     OR NEW.retired_at IS NULL
     OR NEW.id IS DISTINCT FROM OLD.id
     OR NEW.person_id IS DISTINCT FROM OLD.person_id
     OR NEW.public_key IS DISTINCT FROM OLD.public_key
     OR NEW.fingerprint IS DISTINCT FROM OLD.fingerprint
     OR NEW.sealed_secret_key IS DISTINCT FROM OLD.sealed_secret_key
     OR NEW.created_at IS DISTINCT FROM OLD.created_at THEN
    RAISE EXCEPTION 'signing_keys: only retiring an active key is allowed' USING ERRCODE = 'insufficient_privilege';
  END IF;
  RETURN NEW;
END;
$$ LANGUAGE plpgsql;
--> statement-breakpoint
CREATE TRIGGER signing_keys_guard BEFORE UPDATE OR DELETE ON signing_keys
  FOR EACH ROW EXECUTE FUNCTION thermotome_signing_key_guard();
--> statement-breakpoint
CREATE TRIGGER signing_keys_no_truncate BEFORE TRUNCATE ON signing_keys
  FOR EACH STATEMENT EXECUTE FUNCTION thermotome_refuse_change();
