-- A show's checklist_activity rises with every statement that writes its checks, results,
-- stand-downs, restores or sign-off, so a copy of the checklist kept by an app server is known to be
-- current from one read of the show's row. Once per statement, not per row.
CREATE OR REPLACE FUNCTION gloaming_checklist_activity() RETURNS trigger AS $$
BEGIN
	IF TG_OP = 'DELETE' THEN
		UPDATE shows SET checklist_activity = checklist_activity + 1
			WHERE id IN (SELECT DISTINCT show_id FROM changed_old);
	ELSE
		UPDATE shows SET checklist_activity = checklist_activity + 1
			WHERE id IN (SELECT DISTINCT show_id FROM changed_new);
	END IF;
	RETURN NULL;
END;
$$ LANGUAGE plpgsql;
--> statement-breakpoint
CREATE OR REPLACE FUNCTION gloaming_checklist_restore_activity() RETURNS trigger AS $$
BEGIN
	UPDATE shows SET checklist_activity = checklist_activity + 1
		WHERE id IN (SELECT DISTINCT d.show_id FROM stand_downs d
			JOIN changed_new r ON r.stand_down_id = d.id);
	RETURN NULL;
END;
$$ LANGUAGE plpgsql;
--> statement-breakpoint
DO $$
DECLARE
	t text;
BEGIN
	FOREACH t IN ARRAY ARRAY['checks', 'check_results', 'stand_downs', 'sign_offs']
	LOOP
		EXECUTE format('CREATE TRIGGER %I AFTER INSERT ON %I REFERENCING NEW TABLE AS changed_new
			FOR EACH STATEMENT EXECUTE FUNCTION gloaming_checklist_activity()', t || '_activity_ins', t);
		EXECUTE format('CREATE TRIGGER %I AFTER UPDATE ON %I REFERENCING NEW TABLE AS changed_new
			FOR EACH STATEMENT EXECUTE FUNCTION gloaming_checklist_activity()', t || '_activity_upd', t);
		EXECUTE format('CREATE TRIGGER %I AFTER DELETE ON %I REFERENCING OLD TABLE AS changed_old
			FOR EACH STATEMENT EXECUTE FUNCTION gloaming_checklist_activity()', t || '_activity_del', t);
	END LOOP;
END;
$$;
--> statement-breakpoint
CREATE TRIGGER stand_down_restores_activity_ins AFTER INSERT ON stand_down_restores
	REFERENCING NEW TABLE AS changed_new
	FOR EACH STATEMENT EXECUTE FUNCTION gloaming_checklist_restore_activity();
