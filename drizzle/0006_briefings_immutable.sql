-- A signed briefing and its signed file never change (see server/db/schema/briefings.ts).
CREATE FUNCTION briefings_keep_signed() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  IF OLD.status = 'signed' THEN
    RAISE EXCEPTION 'briefing % is signed and cannot be changed or deleted', OLD.id
      USING ERRCODE = 'integrity_constraint_violation';
  END IF;
  RETURN CASE WHEN TG_OP = 'DELETE' THEN OLD ELSE NEW END;
END $$;
--> statement-breakpoint
CREATE TRIGGER briefings_keep_signed BEFORE UPDATE OR DELETE ON briefings
  FOR EACH ROW EXECUTE FUNCTION briefings_keep_signed();
--> statement-breakpoint
CREATE FUNCTION briefing_files_keep_signed() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  RAISE EXCEPTION 'the signed file of briefing % cannot be changed or deleted', OLD.briefing_id
    USING ERRCODE = 'integrity_constraint_violation';
END $$;
--> statement-breakpoint
CREATE TRIGGER briefing_files_keep_signed BEFORE UPDATE OR DELETE ON briefing_files
  FOR EACH ROW WHEN (OLD.kind = 'signed') EXECUTE FUNCTION briefing_files_keep_signed();
