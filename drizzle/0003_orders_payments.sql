CREATE TABLE `orders` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`quote_id` bigint unsigned NOT NULL,
	`revision_id` bigint unsigned NOT NULL,
	`customer_id` varchar(40) NOT NULL,
	`state` enum('awaiting_payment','paid','in_production','inspected','shipped') NOT NULL DEFAULT 'awaiting_payment',
	`quantity` int unsigned NOT NULL,
	`amount_minor` bigint NOT NULL,
	`currency` char(3) NOT NULL,
	`checkout_session_id` varchar(255) NOT NULL,
	`payment_reference` varchar(255),
	`last_payment_problem` varchar(500),
	`paid_at` datetime(3),
	`shipped_at` datetime(3),
	`tracking_note` varchar(500),
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`updated_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `orders_id` PRIMARY KEY(`id`),
	CONSTRAINT `orders_quote_uq` UNIQUE(`quote_id`),
	CONSTRAINT `orders_checkout_session_uq` UNIQUE(`checkout_session_id`)
);
--> statement-breakpoint
CREATE TABLE `payment_events` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`event_id` varchar(255) NOT NULL,
	`type` varchar(100) NOT NULL,
	`order_id` bigint unsigned,
	`outcome` varchar(40) NOT NULL,
	`detail` varchar(500) NOT NULL,
	`received_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `payment_events_id` PRIMARY KEY(`id`),
	CONSTRAINT `payment_events_event_uq` UNIQUE(`event_id`)
);
--> statement-breakpoint
CREATE TABLE `quotes` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`revision_id` bigint unsigned NOT NULL,
	`spec_sha256` char(64) NOT NULL,
	`requested_by_id` varchar(40) NOT NULL,
	`quantity` int unsigned NOT NULL,
	`currency` char(3) NOT NULL,
	`currency_minor_digits` int unsigned NOT NULL,
	`lines` json NOT NULL,
	`rates` json NOT NULL,
	`per_plate_minor` bigint NOT NULL,
	`parts_minor` bigint NOT NULL,
	`discount_minor` bigint NOT NULL,
	`setup_minor` bigint NOT NULL,
	`tax_minor` bigint NOT NULL,
	`total_minor` bigint NOT NULL,
	`valid_until` datetime(3) NOT NULL,
	`state` enum('open','accepted') NOT NULL DEFAULT 'open',
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `quotes_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `shop_settings` (
	`id` int unsigned NOT NULL,
	`rates` json NOT NULL,
	`updated_by_id` varchar(40),
	`updated_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `shop_settings_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
ALTER TABLE `orders` ADD CONSTRAINT `orders_quote_id_quotes_id_fk` FOREIGN KEY (`quote_id`) REFERENCES `quotes`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `orders` ADD CONSTRAINT `orders_revision_id_revisions_id_fk` FOREIGN KEY (`revision_id`) REFERENCES `revisions`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `orders` ADD CONSTRAINT `orders_customer_id_users_id_fk` FOREIGN KEY (`customer_id`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `payment_events` ADD CONSTRAINT `payment_events_order_id_orders_id_fk` FOREIGN KEY (`order_id`) REFERENCES `orders`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `quotes` ADD CONSTRAINT `quotes_revision_id_revisions_id_fk` FOREIGN KEY (`revision_id`) REFERENCES `revisions`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `quotes` ADD CONSTRAINT `quotes_requested_by_id_users_id_fk` FOREIGN KEY (`requested_by_id`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `shop_settings` ADD CONSTRAINT `shop_settings_updated_by_id_users_id_fk` FOREIGN KEY (`updated_by_id`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX `orders_customer_idx` ON `orders` (`customer_id`);--> statement-breakpoint
CREATE INDEX `orders_state_idx` ON `orders` (`state`);--> statement-breakpoint
CREATE INDEX `payment_events_order_idx` ON `payment_events` (`order_id`);--> statement-breakpoint
CREATE INDEX `quotes_revision_idx` ON `quotes` (`revision_id`);--> statement-breakpoint
CREATE INDEX `quotes_requested_by_idx` ON `quotes` (`requested_by_id`);