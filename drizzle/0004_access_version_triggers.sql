-- Every change to a table the access guards read moves access_version on, in the same transaction,
-- so a remembered guard decision is known to be stale whichever process made the change.
INSERT INTO access_version (id, version) VALUES (1, 0);
--> statement-breakpoint
CREATE TRIGGER users_insert_moves_access_version AFTER INSERT ON users
BEGIN
  UPDATE access_version SET version = version + 1 WHERE id = 1;
END;
--> statement-breakpoint
CREATE TRIGGER users_update_moves_access_version AFTER UPDATE ON users
BEGIN
  UPDATE access_version SET version = version + 1 WHERE id = 1;
END;
--> statement-breakpoint
CREATE TRIGGER users_delete_moves_access_version AFTER DELETE ON users
BEGIN
  UPDATE access_version SET version = version + 1 WHERE id = 1;
END;
--> statement-breakpoint
CREATE TRIGGER sessions_insert_moves_access_version AFTER INSERT ON sessions
BEGIN
  UPDATE access_version SET version = version + 1 WHERE id = 1;
END;
--> statement-breakpoint
CREATE TRIGGER sessions_update_moves_access_version AFTER UPDATE ON sessions
BEGIN
  UPDATE access_version SET version = version + 1 WHERE id = 1;
END;
--> statement-breakpoint
CREATE TRIGGER sessions_delete_moves_access_version AFTER DELETE ON sessions
BEGIN
  UPDATE access_version SET version = version + 1 WHERE id = 1;
END;
--> statement-breakpoint
CREATE TRIGGER api_tokens_insert_moves_access_version AFTER INSERT ON api_tokens
BEGIN
  UPDATE access_version SET version = version + 1 WHERE id = 1;
END;
--> statement-breakpoint
CREATE TRIGGER api_tokens_update_moves_access_version AFTER UPDATE ON api_tokens
BEGIN
  UPDATE access_version SET version = version + 1 WHERE id = 1;
END;
--> statement-breakpoint
CREATE TRIGGER api_tokens_delete_moves_access_version AFTER DELETE ON api_tokens
BEGIN
  UPDATE access_version SET version = version + 1 WHERE id = 1;
END;
--> statement-breakpoint
CREATE TRIGGER lab_members_insert_moves_access_version AFTER INSERT ON lab_members
BEGIN
  UPDATE access_version SET version = version + 1 WHERE id = 1;
END;
--> statement-breakpoint
CREATE TRIGGER lab_members_update_moves_access_version AFTER UPDATE ON lab_members
BEGIN
  UPDATE access_version SET version = version + 1 WHERE id = 1;
END;
--> statement-breakpoint
CREATE TRIGGER lab_members_delete_moves_access_version AFTER DELETE ON lab_members
BEGIN
  UPDATE access_version SET version = version + 1 WHERE id = 1;
END;
--> statement-breakpoint
CREATE TRIGGER studies_insert_moves_access_version AFTER INSERT ON studies
BEGIN
  UPDATE access_version SET version = version + 1 WHERE id = 1;
END;
--> statement-breakpoint
CREATE TRIGGER studies_update_moves_access_version AFTER UPDATE ON studies
BEGIN
  UPDATE access_version SET version = version + 1 WHERE id = 1;
END;
--> statement-breakpoint
CREATE TRIGGER studies_delete_moves_access_version AFTER DELETE ON studies
BEGIN
  UPDATE access_version SET version = version + 1 WHERE id = 1;
END;
--> statement-breakpoint
CREATE TRIGGER study_coordinators_insert_moves_access_version AFTER INSERT ON study_coordinators
BEGIN
  UPDATE access_version SET version = version + 1 WHERE id = 1;
END;
--> statement-breakpoint
CREATE TRIGGER study_coordinators_update_moves_access_version AFTER UPDATE ON study_coordinators
BEGIN
  UPDATE access_version SET version = version + 1 WHERE id = 1;
END;
--> statement-breakpoint
CREATE TRIGGER study_coordinators_delete_moves_access_version AFTER DELETE ON study_coordinators
BEGIN
  UPDATE access_version SET version = version + 1 WHERE id = 1;
END;
--> statement-breakpoint
CREATE TRIGGER study_reviewers_insert_moves_access_version AFTER INSERT ON study_reviewers
BEGIN
  UPDATE access_version SET version = version + 1 WHERE id = 1;
END;
--> statement-breakpoint
CREATE TRIGGER study_reviewers_update_moves_access_version AFTER UPDATE ON study_reviewers
BEGIN
  UPDATE access_version SET version = version + 1 WHERE id = 1;
END;
--> statement-breakpoint
CREATE TRIGGER study_reviewers_delete_moves_access_version AFTER DELETE ON study_reviewers
BEGIN
  UPDATE access_version SET version = version + 1 WHERE id = 1;
END;
--> statement-breakpoint
CREATE TRIGGER enrollments_insert_moves_access_version AFTER INSERT ON enrollments
BEGIN
  UPDATE access_version SET version = version + 1 WHERE id = 1;
END;
--> statement-breakpoint
CREATE TRIGGER enrollments_update_moves_access_version AFTER UPDATE ON enrollments
BEGIN
  UPDATE access_version SET version = version + 1 WHERE id = 1;
END;
--> statement-breakpoint
CREATE TRIGGER enrollments_delete_moves_access_version AFTER DELETE ON enrollments
BEGIN
  UPDATE access_version SET version = version + 1 WHERE id = 1;
END;
