CREATE TABLE `figures` (
	`id` text PRIMARY KEY NOT NULL,
	`manuscript_id` text NOT NULL,
	`number` integer NOT NULL,
	`title` text NOT NULL,
	`width_mm` real DEFAULT 183 NOT NULL,
	`max_height_mm` real DEFAULT 170 NOT NULL,
	`columns` integer DEFAULT 2 NOT NULL,
	`required_reviewers` text DEFAULT '[]' NOT NULL,
	`created_by` text NOT NULL,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`manuscript_id`) REFERENCES `manuscripts`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`created_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `figures_manuscript_number` ON `figures` (`manuscript_id`,`number`);--> statement-breakpoint
CREATE TABLE `panels` (
	`id` text PRIMARY KEY NOT NULL,
	`figure_id` text NOT NULL,
	`position` integer NOT NULL,
	`title` text DEFAULT '' NOT NULL,
	`col_span` integer DEFAULT 1 NOT NULL,
	`current_revision_id` text,
	`created_by` text NOT NULL,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`figure_id`) REFERENCES `figures`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`created_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `panels_figure` ON `panels` (`figure_id`,`position`);--> statement-breakpoint
CREATE TABLE `revisions` (
	`id` text PRIMARY KEY NOT NULL,
	`panel_id` text NOT NULL,
	`number` integer NOT NULL,
	`spec` text NOT NULL,
	`bindings` text NOT NULL,
	`bound` text NOT NULL,
	`message` text DEFAULT '' NOT NULL,
	`content_hash` text NOT NULL,
	`created_by` text NOT NULL,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`panel_id`) REFERENCES `panels`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`created_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `revisions_panel_number` ON `revisions` (`panel_id`,`number`);--> statement-breakpoint
CREATE INDEX `revisions_hash` ON `revisions` (`content_hash`);