-- Signed tree heads of the audit log are kept as written, like the log they anchor.
CREATE TRIGGER audit_checkpoints_frozen BEFORE UPDATE OR DELETE ON audit_checkpoints
  FOR EACH ROW EXECUTE FUNCTION thermotome_refuse_change();
--> statement-breakpoint
CREATE TRIGGER audit_checkpoints_no_truncate BEFORE TRUNCATE ON audit_checkpoints
  FOR EACH STATEMENT EXECUTE FUNCTION thermotome_refuse_change();
