CREATE INDEX "scene_cues_venue_output" ON "scene_cues" USING btree ("venue_id","output_id");--> statement-breakpoint
CREATE INDEX "scene_responses_venue_output" ON "scene_responses" USING btree ("venue_id","output_id");--> statement-breakpoint
CREATE INDEX "scene_responses_venue_sensor" ON "scene_responses" USING btree ("venue_id","sensor_id");