CREATE TABLE `mail_preferences` (
	`user_id` text PRIMARY KEY NOT NULL,
	`muted_kinds` text DEFAULT '[]' NOT NULL,
	`unfollowed` text DEFAULT '[]' NOT NULL,
	`updated_at` integer NOT NULL,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE TABLE `notices` (
	`id` text PRIMARY KEY NOT NULL,
	`user_id` text NOT NULL,
	`kind` text NOT NULL,
	`manuscript_id` text,
	`subject` text NOT NULL,
	`headline` text NOT NULL,
	`body` text NOT NULL,
	`href` text NOT NULL,
	`mail_id` text,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`mail_id`) REFERENCES `mail_outbox`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `notices_pending` ON `notices` (`mail_id`,`user_id`,`created_at`);--> statement-breakpoint
ALTER TABLE `mail_outbox` ADD `headers` text;