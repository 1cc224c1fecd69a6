-- A show's checklist is generated from the venue's scenes, props, sensors, outputs, rooms and safety
-- items, and from the scenes left out of that show. Any write to those tables raises the venue's
-- checklist_inputs_version (once per statement, not per row), or clears the show's own
-- checklist_version for a change to the scenes left out of it. Readers compare the two numbers and
-- regenerate a stale checklist once; a write path added later is covered without anyone remembering.
CREATE OR REPLACE FUNCTION gloaming_checklist_inputs_changed() RETURNS trigger AS $$
BEGIN
	IF TG_OP = 'DELETE' THEN
		UPDATE venues SET checklist_inputs_version = checklist_inputs_version + 1
			WHERE id IN (SELECT DISTINCT venue_id FROM changed_old);
	ELSE
		UPDATE venues SET checklist_inputs_version = checklist_inputs_version + 1
			WHERE id IN (SELECT DISTINCT venue_id FROM changed_new);
	END IF;
	RETURN NULL;
END;
$$ LANGUAGE plpgsql;
--> statement-breakpoint
CREATE OR REPLACE FUNCTION gloaming_show_scenes_changed() RETURNS trigger AS $$
BEGIN
	IF TG_OP = 'DELETE' THEN
		UPDATE shows SET checklist_version = NULL
			WHERE id IN (SELECT DISTINCT show_id FROM changed_old) AND checklist_version IS NOT NULL;
	ELSE
		UPDATE shows SET checklist_version = NULL
			WHERE id IN (SELECT DISTINCT show_id FROM changed_new) AND checklist_version IS NOT NULL;
	END IF;
	RETURN NULL;
END;
$$ LANGUAGE plpgsql;
--> statement-breakpoint
DO $$
DECLARE
	t text;
BEGIN
	FOREACH t IN ARRAY ARRAY['scenes', 'scene_cues', 'scene_responses', 'props', 'sensors', 'outputs',
		'rooms', 'venue_safety_items']
	LOOP
		EXECUTE format('CREATE TRIGGER %I AFTER INSERT ON %I REFERENCING NEW TABLE AS changed_new
			FOR EACH STATEMENT EXECUTE FUNCTION gloaming_checklist_inputs_changed()', t || '_checklist_ins', t);
		EXECUTE format('CREATE TRIGGER %I AFTER UPDATE ON %I REFERENCING NEW TABLE AS changed_new
			FOR EACH STATEMENT EXECUTE FUNCTION gloaming_checklist_inputs_changed()', t || '_checklist_upd', t);
		EXECUTE format('CREATE TRIGGER %I AFTER DELETE ON %I REFERENCING OLD TABLE AS changed_old
			FOR EACH STATEMENT EXECUTE FUNCTION gloaming_checklist_inputs_changed()', t || '_checklist_del', t);
	END LOOP;
END;
$$;
--> statement-breakpoint
CREATE TRIGGER show_scene_exclusions_checklist_ins AFTER INSERT ON show_scene_exclusions
	REFERENCING NEW TABLE AS changed_new
	FOR EACH STATEMENT EXECUTE FUNCTION gloaming_show_scenes_changed();
--> statement-breakpoint
CREATE TRIGGER show_scene_exclusions_checklist_upd AFTER UPDATE ON show_scene_exclusions
	REFERENCING NEW TABLE AS changed_new
	FOR EACH STATEMENT EXECUTE FUNCTION gloaming_show_scenes_changed();
--> statement-breakpoint
CREATE TRIGGER show_scene_exclusions_checklist_del AFTER DELETE ON show_scene_exclusions
	REFERENCING OLD TABLE AS changed_old
	FOR EACH STATEMENT EXECUTE FUNCTION gloaming_show_scenes_changed();
