-- A revision's content never changes once saved: only its status moves through the workflow.
CREATE TRIGGER `revisions_content_immutable` BEFORE UPDATE ON `revisions` FOR EACH ROW
IF NOT (NEW.`spec` <=> OLD.`spec`) OR NOT (NEW.`spec_sha256` <=> OLD.`spec_sha256`)
   OR NOT (NEW.`spec_schema_version` <=> OLD.`spec_schema_version`) OR NOT (NEW.`checks` <=> OLD.`checks`)
   OR NOT (NEW.`author_id` <=> OLD.`author_id`) OR NOT (NEW.`plate_id` <=> OLD.`plate_id`)
   OR NOT (NEW.`number` <=> OLD.`number`) OR NOT (NEW.`parent_revision_id` <=> OLD.`parent_revision_id`)
   OR NOT (NEW.`message` <=> OLD.`message`) OR NOT (NEW.`created_at` <=> OLD.`created_at`) THEN
  SIGNAL SQLSTATE '45000' SET MESSAGE_TEXT = 'revisions are immutable: only the status may change';
END IF;
--> statement-breakpoint
CREATE TRIGGER `revisions_no_delete` BEFORE DELETE ON `revisions` FOR EACH ROW
  SIGNAL SQLSTATE '45000' SET MESSAGE_TEXT = 'revisions are never deleted';
--> statement-breakpoint
CREATE TRIGGER `artifacts_immutable` BEFORE UPDATE ON `artifacts` FOR EACH ROW
  SIGNAL SQLSTATE '45000' SET MESSAGE_TEXT = 'released files are immutable';
--> statement-breakpoint
CREATE TRIGGER `artifacts_no_delete` BEFORE DELETE ON `artifacts` FOR EACH ROW
  SIGNAL SQLSTATE '45000' SET MESSAGE_TEXT = 'released files are never deleted';
