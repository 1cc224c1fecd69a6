-- Incidents and their follow-up and closing notes are history like faults: never changed, never
-- removed, except with their venue (and an incident's notes with it). A night with incidents is
-- kept: removing its show is refused.
CREATE OR REPLACE FUNCTION gloaming_refuse_history_change() RETURNS trigger AS $$
BEGIN
	IF pg_trigger_depth() > 1 AND TG_OP = 'UPDATE' THEN
		RETURN NEW;
	END IF;
	IF pg_trigger_depth() > 1 AND TG_OP = 'DELETE' THEN
		IF NOT EXISTS (SELECT 1 FROM venues WHERE id = OLD.venue_id) THEN
			RETURN OLD;
		END IF;
		IF TG_TABLE_NAME = 'stand_downs' THEN
			IF NOT EXISTS (SELECT 1 FROM props WHERE id = OLD.prop_id) THEN
				RETURN OLD;
			END IF;
		END IF;
		IF TG_TABLE_NAME = 'faults' THEN
			IF NOT EXISTS (SELECT 1 FROM props WHERE id = OLD.prop_id) THEN
				RETURN OLD;
			END IF;
		END IF;
		IF TG_TABLE_NAME = 'fault_events' THEN
			IF NOT EXISTS (SELECT 1 FROM faults WHERE id = OLD.fault_id) THEN
				RETURN OLD;
			END IF;
		END IF;
		IF TG_TABLE_NAME = 'incident_events' THEN
			IF NOT EXISTS (SELECT 1 FROM incidents WHERE id = OLD.incident_id) THEN
				RETURN OLD;
			END IF;
		END IF;
		IF TG_TABLE_NAME = 'stand_down_restores' THEN
			IF NOT EXISTS (SELECT 1 FROM stand_downs WHERE id = OLD.stand_down_id) THEN
				RETURN OLD;
			END IF;
		END IF;
		RAISE EXCEPTION '% is kept for good: a night with recorded checks or incidents cannot be removed', TG_TABLE_NAME
			USING ERRCODE = 'restrict_violation';
	END IF;
	RAISE EXCEPTION '% is append-only: record a new entry instead of changing one', TG_TABLE_NAME
		USING ERRCODE = 'restrict_violation';
END;
$$ LANGUAGE plpgsql;
--> statement-breakpoint
CREATE TRIGGER incidents_append_only BEFORE UPDATE OR DELETE ON incidents
	FOR EACH ROW EXECUTE FUNCTION gloaming_refuse_history_change();
--> statement-breakpoint
CREATE TRIGGER incident_events_append_only BEFORE UPDATE OR DELETE ON incident_events
	FOR EACH ROW EXECUTE FUNCTION gloaming_refuse_history_change();
