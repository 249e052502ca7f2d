CREATE TABLE `thread_follows` (
	`thread_id` text NOT NULL,
	`user_id` text NOT NULL,
	`following` integer NOT NULL,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	PRIMARY KEY(`thread_id`, `user_id`),
	FOREIGN KEY (`thread_id`) REFERENCES `threads`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
ALTER TABLE `manuscripts` ADD `house_style` text;--> statement-breakpoint
ALTER TABLE `analyses` ADD `archived_at` integer;--> statement-breakpoint
ALTER TABLE `datasets` ADD `archived_at` integer;--> statement-breakpoint
ALTER TABLE `figures` ADD `archived_at` integer;--> statement-breakpoint
ALTER TABLE `panels` ADD `review_requested_at` integer;--> statement-breakpoint
ALTER TABLE `panels` ADD `archived_at` integer;--> statement-breakpoint
ALTER TABLE `signoffs` ADD `withdrawn_at` integer;--> statement-breakpoint
ALTER TABLE `signoffs` ADD `withdrawn_by` text REFERENCES users(id);--> statement-breakpoint
ALTER TABLE `signoffs` ADD `withdraw_reason` text;--> statement-breakpoint
ALTER TABLE `mail_preferences` ADD `unfollowed_figures` text DEFAULT '[]' NOT NULL;--> statement-breakpoint
ALTER TABLE `notices` ADD `figure_id` text;--> statement-breakpoint
UPDATE `panels` SET `review_requested_at` = `created_at`;
