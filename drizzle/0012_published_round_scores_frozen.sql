-- A published round's scores and report never change.
CREATE TRIGGER round_scores_no_update BEFORE UPDATE ON round_scores
BEGIN
  SELECT RAISE(ABORT, 'published round scores never change');
END;
--> statement-breakpoint
CREATE TRIGGER round_scores_no_delete BEFORE DELETE ON round_scores
BEGIN
  SELECT RAISE(ABORT, 'published round scores never change');
END;
--> statement-breakpoint
CREATE TRIGGER round_settings_published_frozen BEFORE UPDATE ON round_settings
WHEN OLD.published_report IS NOT NULL
BEGIN
  SELECT RAISE(ABORT, 'a published round report never changes');
END;
