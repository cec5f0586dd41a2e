-- The log is append-only: no role, admin included, may change or remove an entry.
CREATE OR REPLACE FUNCTION rimelog_refuse_change() RETURNS trigger AS $$
BEGIN
  RAISE EXCEPTION 'entries are append-only: % refused (write a correction instead)', TG_OP;
END;
$$ LANGUAGE plpgsql;
--> statement-breakpoint
CREATE TRIGGER entries_append_only BEFORE UPDATE OR DELETE ON entries
  FOR EACH ROW EXECUTE FUNCTION rimelog_refuse_change();
--> statement-breakpoint
CREATE TRIGGER entries_no_truncate BEFORE TRUNCATE ON entries
  FOR EACH STATEMENT EXECUTE FUNCTION rimelog_refuse_change();
