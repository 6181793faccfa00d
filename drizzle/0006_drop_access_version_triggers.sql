-- The access version served only a repeat-read shortcut in front of the framework, which is gone:
-- its triggers go first, so no write to a guarded table touches the table dropped next.
DROP TRIGGER IF EXISTS `users_insert_moves_access_version`;
--> statement-breakpoint
DROP TRIGGER IF EXISTS `users_update_moves_access_version`;
--> statement-breakpoint
DROP TRIGGER IF EXISTS `users_delete_moves_access_version`;
--> statement-breakpoint
DROP TRIGGER IF EXISTS `sessions_insert_moves_access_version`;
--> statement-breakpoint
DROP TRIGGER IF EXISTS `sessions_update_moves_access_version`;
--> statement-breakpoint
DROP TRIGGER IF EXISTS `sessions_delete_moves_access_version`;
--> statement-breakpoint
DROP TRIGGER IF EXISTS `api_tokens_insert_moves_access_version`;
--> statement-breakpoint
DROP TRIGGER IF EXISTS `api_tokens_update_moves_access_version`;
--> statement-breakpoint
DROP TRIGGER IF EXISTS `api_tokens_delete_moves_access_version`;
--> statement-breakpoint
DROP TRIGGER IF EXISTS `lab_members_insert_moves_access_version`;
--> statement-breakpoint
DROP TRIGGER IF EXISTS `lab_members_update_moves_access_version`;
--> statement-breakpoint
DROP TRIGGER IF EXISTS `lab_members_delete_moves_access_version`;
--> statement-breakpoint
DROP TRIGGER IF EXISTS `studies_insert_moves_access_version`;
--> statement-breakpoint
DROP TRIGGER IF EXISTS `studies_update_moves_access_version`;
--> statement-breakpoint
DROP TRIGGER IF EXISTS `studies_delete_moves_access_version`;
--> statement-breakpoint
DROP TRIGGER IF EXISTS `study_coordinators_insert_moves_access_version`;
--> statement-breakpoint
DROP TRIGGER IF EXISTS `study_coordinators_update_moves_access_version`;
--> statement-breakpoint
DROP TRIGGER IF EXISTS `study_coordinators_delete_moves_access_version`;
--> statement-breakpoint
DROP TRIGGER IF EXISTS `study_reviewers_insert_moves_access_version`;
--> statement-breakpoint
DROP TRIGGER IF EXISTS `study_reviewers_update_moves_access_version`;
--> statement-breakpoint
DROP TRIGGER IF EXISTS `study_reviewers_delete_moves_access_version`;
--> statement-breakpoint
DROP TRIGGER IF EXISTS `enrollments_insert_moves_access_version`;
--> statement-breakpoint
DROP TRIGGER IF EXISTS `enrollments_update_moves_access_version`;
--> statement-breakpoint
DROP TRIGGER IF EXISTS `enrollments_delete_moves_access_version`;
