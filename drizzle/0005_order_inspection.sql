ALTER TABLE `orders` ADD `inspection_id` bigint unsigned;--> statement-breakpoint
ALTER TABLE `orders` ADD CONSTRAINT `orders_inspection_uq` UNIQUE(`inspection_id`);--> statement-breakpoint
ALTER TABLE `orders` ADD CONSTRAINT `orders_inspection_id_inspections_id_fk` FOREIGN KEY (`inspection_id`) REFERENCES `inspections`(`id`) ON DELETE no action ON UPDATE no action;