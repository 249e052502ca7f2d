CREATE TABLE `mail_bounces` (
	`email` text PRIMARY KEY NOT NULL,
	`answer` text NOT NULL,
	`at` integer NOT NULL
);
