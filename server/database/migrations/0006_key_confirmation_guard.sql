-- Keys registered before confirmation existed were all allowed to sign: confirm them as of
-- their making (the owner runs migrations; the guard is paused for this one backfill only).
ALTER TABLE signing_keys DISABLE TRIGGER signing_keys_guard;
--> statement-breakpoint
UPDATE signing_keys SET confirmed_at = created_at WHERE confirmed_at IS NULL;
--> statement-breakpoint
ALTER TABLE signing_keys ENABLE TRIGGER signing_keys_guard;
--> statement-breakpoint
-- Public keys are kept forever. Two changes are allowed, each once: retiring an active key,
-- and confirming a waiting key (who confirmed it and why). Nothing else about a key changes.
CREATE OR REPLACE FUNCTION thermotome_signing_key_guard() RETURNS trigger AS $$
BEGIN
  IF TG_OP = 'DELETE' THEN
    RAISE EXCEPTION 'signing_keys are kept forever: DELETE refused' USING ERRCODE = 'insufficient_privilege';
  END IF;
  IF NEW.id IS DISTINCT FROM OLD.id
     OR NEW.person_id IS DISTINCT FROM OLD.person_id
     OR NEW.public_key IS DISTINCT FROM OLD.public_key
     OR NEW.fingerprint IS DISTINCT FROM OLD.fingerprint
     OR NEW.sealed_secret_key IS DISTINCT FROM OLD.sealed_secret_key
     OR NEW.created_at IS DISTINCT FROM OLD.created_at
     OR (OLD.retired_at IS NOT NULL AND (NEW.retired_at IS DISTINCT FROM OLD.retired_at OR NEW.retired_reason IS DISTINCT FROM OLD.retired_reason))
     OR (OLD.retired_at IS NULL AND NEW.retired_at IS NULL AND NEW.retired_reason IS DISTINCT FROM OLD.retired_reason)
     OR (OLD.confirmed_at IS NOT NULL AND (NEW.confirmed_at IS DISTINCT FROM OLD.confirmed_at
         OR NEW.confirmed_by IS DISTINCT FROM OLD.confirmed_by OR NEW.confirmation_reason IS DISTINCT FROM OLD.confirmation_reason))
     OR (OLD.confirmed_at IS NULL AND NEW.confirmed_at IS NULL
         AND (NEW.confirmed_by IS DISTINCT FROM OLD.confirmed_by OR NEW.confirmation_reason IS DISTINCT FROM OLD.confirmation_reason))
     OR (OLD.confirmed_at IS NULL AND NEW.confirmed_at IS NOT NULL AND OLD.retired_at IS NOT NULL) THEN
    RAISE EXCEPTION 'signing_keys: only retiring an active key or confirming a waiting one is allowed' USING ERRCODE = 'insufficient_privilege';
  END IF;
  RETURN NEW;
END;
$$ LANGUAGE plpgsql;
