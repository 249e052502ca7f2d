CREATE TABLE `digest_runs` (
	`id` text PRIMARY KEY NOT NULL,
	`user_id` text NOT NULL,
	`period_start` integer NOT NULL,
	`since` integer NOT NULL,
	`items` integer NOT NULL,
	`mail_id` text,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`mail_id`) REFERENCES `mail_outbox`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `digest_runs_user_period` ON `digest_runs` (`user_id`,`period_start`);--> statement-breakpoint
ALTER TABLE `mail_preferences` ADD `digest` text DEFAULT 'daily' NOT NULL;--> statement-breakpoint
ALTER TABLE `mail_preferences` ADD `digest_hour` integer DEFAULT 8 NOT NULL;--> statement-breakpoint
ALTER TABLE `mail_preferences` ADD `time_zone` text;