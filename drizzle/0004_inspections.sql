CREATE TABLE `inspections` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`revision_id` bigint unsigned NOT NULL,
	`plate_id` bigint unsigned NOT NULL,
	`machinist_id` varchar(40) NOT NULL,
	`state` enum('in_progress','passed','failed','accepted_with_deviation') NOT NULL DEFAULT 'in_progress',
	`spec_sha256` char(64) NOT NULL,
	`artifact_hashes` json NOT NULL,
	`measurements` json NOT NULL,
	`results` json,
	`note` text,
	`accepted_by_id` varchar(40),
	`accept_comment` text,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`updated_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`completed_at` datetime(3),
	`accepted_at` datetime(3),
	CONSTRAINT `inspections_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
ALTER TABLE `inspections` ADD CONSTRAINT `inspections_revision_id_revisions_id_fk` FOREIGN KEY (`revision_id`) REFERENCES `revisions`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `inspections` ADD CONSTRAINT `inspections_plate_id_plates_id_fk` FOREIGN KEY (`plate_id`) REFERENCES `plates`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `inspections` ADD CONSTRAINT `inspections_machinist_id_users_id_fk` FOREIGN KEY (`machinist_id`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `inspections` ADD CONSTRAINT `inspections_accepted_by_id_users_id_fk` FOREIGN KEY (`accepted_by_id`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX `inspections_revision_idx` ON `inspections` (`revision_id`);--> statement-breakpoint
CREATE INDEX `inspections_plate_idx` ON `inspections` (`plate_id`);--> statement-breakpoint
CREATE INDEX `inspections_state_idx` ON `inspections` (`state`);