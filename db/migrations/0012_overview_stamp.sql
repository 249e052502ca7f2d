ALTER TABLE `manuscripts` ADD `review_stamp` integer DEFAULT 0 NOT NULL;
--> statement-breakpoint
CREATE TRIGGER `figures_insert_review_stamp` AFTER INSERT ON `figures` BEGIN UPDATE `manuscripts` SET `review_stamp` = `review_stamp` + 1 WHERE `id` IN (NEW.`manuscript_id`); END;
--> statement-breakpoint
CREATE TRIGGER `figures_update_review_stamp` AFTER UPDATE ON `figures` BEGIN UPDATE `manuscripts` SET `review_stamp` = `review_stamp` + 1 WHERE `id` IN (OLD.`manuscript_id`, NEW.`manuscript_id`); END;
--> statement-breakpoint
CREATE TRIGGER `figures_delete_review_stamp` AFTER DELETE ON `figures` BEGIN UPDATE `manuscripts` SET `review_stamp` = `review_stamp` + 1 WHERE `id` IN (OLD.`manuscript_id`); END;
--> statement-breakpoint
CREATE TRIGGER `panels_insert_review_stamp` AFTER INSERT ON `panels` BEGIN UPDATE `manuscripts` SET `review_stamp` = `review_stamp` + 1 WHERE `id` IN ((SELECT `manuscript_id` FROM `figures` WHERE `id` = NEW.`figure_id`)); END;
--> statement-breakpoint
CREATE TRIGGER `panels_update_review_stamp` AFTER UPDATE ON `panels` BEGIN UPDATE `manuscripts` SET `review_stamp` = `review_stamp` + 1 WHERE `id` IN ((SELECT `manuscript_id` FROM `figures` WHERE `id` = OLD.`figure_id`), (SELECT `manuscript_id` FROM `figures` WHERE `id` = NEW.`figure_id`)); END;
--> statement-breakpoint
CREATE TRIGGER `panels_delete_review_stamp` AFTER DELETE ON `panels` BEGIN UPDATE `manuscripts` SET `review_stamp` = `review_stamp` + 1 WHERE `id` IN ((SELECT `manuscript_id` FROM `figures` WHERE `id` = OLD.`figure_id`)); END;
--> statement-breakpoint
CREATE TRIGGER `revisions_insert_review_stamp` AFTER INSERT ON `revisions` BEGIN UPDATE `manuscripts` SET `review_stamp` = `review_stamp` + 1 WHERE `id` IN ((SELECT f.`manuscript_id` FROM `panels` p JOIN `figures` f ON f.`id` = p.`figure_id` WHERE p.`id` = NEW.`panel_id`)); END;
--> statement-breakpoint
CREATE TRIGGER `revisions_update_review_stamp` AFTER UPDATE ON `revisions` BEGIN UPDATE `manuscripts` SET `review_stamp` = `review_stamp` + 1 WHERE `id` IN ((SELECT f.`manuscript_id` FROM `panels` p JOIN `figures` f ON f.`id` = p.`figure_id` WHERE p.`id` = OLD.`panel_id`), (SELECT f.`manuscript_id` FROM `panels` p JOIN `figures` f ON f.`id` = p.`figure_id` WHERE p.`id` = NEW.`panel_id`)); END;
--> statement-breakpoint
CREATE TRIGGER `revisions_delete_review_stamp` AFTER DELETE ON `revisions` BEGIN UPDATE `manuscripts` SET `review_stamp` = `review_stamp` + 1 WHERE `id` IN ((SELECT f.`manuscript_id` FROM `panels` p JOIN `figures` f ON f.`id` = p.`figure_id` WHERE p.`id` = OLD.`panel_id`)); END;
--> statement-breakpoint
CREATE TRIGGER `decisions_insert_review_stamp` AFTER INSERT ON `decisions` BEGIN UPDATE `manuscripts` SET `review_stamp` = `review_stamp` + 1 WHERE `id` IN ((SELECT f.`manuscript_id` FROM `panels` p JOIN `figures` f ON f.`id` = p.`figure_id` WHERE p.`id` = NEW.`panel_id`)); END;
--> statement-breakpoint
CREATE TRIGGER `decisions_update_review_stamp` AFTER UPDATE ON `decisions` BEGIN UPDATE `manuscripts` SET `review_stamp` = `review_stamp` + 1 WHERE `id` IN ((SELECT f.`manuscript_id` FROM `panels` p JOIN `figures` f ON f.`id` = p.`figure_id` WHERE p.`id` = OLD.`panel_id`), (SELECT f.`manuscript_id` FROM `panels` p JOIN `figures` f ON f.`id` = p.`figure_id` WHERE p.`id` = NEW.`panel_id`)); END;
--> statement-breakpoint
CREATE TRIGGER `decisions_delete_review_stamp` AFTER DELETE ON `decisions` BEGIN UPDATE `manuscripts` SET `review_stamp` = `review_stamp` + 1 WHERE `id` IN ((SELECT f.`manuscript_id` FROM `panels` p JOIN `figures` f ON f.`id` = p.`figure_id` WHERE p.`id` = OLD.`panel_id`)); END;
--> statement-breakpoint
CREATE TRIGGER `signoffs_insert_review_stamp` AFTER INSERT ON `signoffs` BEGIN UPDATE `manuscripts` SET `review_stamp` = `review_stamp` + 1 WHERE `id` IN ((SELECT `manuscript_id` FROM `figures` WHERE `id` = NEW.`figure_id`)); END;
--> statement-breakpoint
CREATE TRIGGER `signoffs_update_review_stamp` AFTER UPDATE ON `signoffs` BEGIN UPDATE `manuscripts` SET `review_stamp` = `review_stamp` + 1 WHERE `id` IN ((SELECT `manuscript_id` FROM `figures` WHERE `id` = OLD.`figure_id`), (SELECT `manuscript_id` FROM `figures` WHERE `id` = NEW.`figure_id`)); END;
--> statement-breakpoint
CREATE TRIGGER `signoffs_delete_review_stamp` AFTER DELETE ON `signoffs` BEGIN UPDATE `manuscripts` SET `review_stamp` = `review_stamp` + 1 WHERE `id` IN ((SELECT `manuscript_id` FROM `figures` WHERE `id` = OLD.`figure_id`)); END;
--> statement-breakpoint
CREATE TRIGGER `threads_insert_review_stamp` AFTER INSERT ON `threads` BEGIN UPDATE `manuscripts` SET `review_stamp` = `review_stamp` + 1 WHERE `id` IN ((SELECT f.`manuscript_id` FROM `panels` p JOIN `figures` f ON f.`id` = p.`figure_id` WHERE p.`id` = NEW.`panel_id`)); END;
--> statement-breakpoint
CREATE TRIGGER `threads_update_review_stamp` AFTER UPDATE ON `threads` BEGIN UPDATE `manuscripts` SET `review_stamp` = `review_stamp` + 1 WHERE `id` IN ((SELECT f.`manuscript_id` FROM `panels` p JOIN `figures` f ON f.`id` = p.`figure_id` WHERE p.`id` = OLD.`panel_id`), (SELECT f.`manuscript_id` FROM `panels` p JOIN `figures` f ON f.`id` = p.`figure_id` WHERE p.`id` = NEW.`panel_id`)); END;
--> statement-breakpoint
CREATE TRIGGER `threads_delete_review_stamp` AFTER DELETE ON `threads` BEGIN UPDATE `manuscripts` SET `review_stamp` = `review_stamp` + 1 WHERE `id` IN ((SELECT f.`manuscript_id` FROM `panels` p JOIN `figures` f ON f.`id` = p.`figure_id` WHERE p.`id` = OLD.`panel_id`)); END;
--> statement-breakpoint
CREATE TRIGGER `manuscript_members_insert_review_stamp` AFTER INSERT ON `manuscript_members` BEGIN UPDATE `manuscripts` SET `review_stamp` = `review_stamp` + 1 WHERE `id` IN (NEW.`manuscript_id`); END;
--> statement-breakpoint
CREATE TRIGGER `manuscript_members_update_review_stamp` AFTER UPDATE ON `manuscript_members` BEGIN UPDATE `manuscripts` SET `review_stamp` = `review_stamp` + 1 WHERE `id` IN (OLD.`manuscript_id`, NEW.`manuscript_id`); END;
--> statement-breakpoint
CREATE TRIGGER `manuscript_members_delete_review_stamp` AFTER DELETE ON `manuscript_members` BEGIN UPDATE `manuscripts` SET `review_stamp` = `review_stamp` + 1 WHERE `id` IN (OLD.`manuscript_id`); END;
--> statement-breakpoint
CREATE TRIGGER `datasets_insert_review_stamp` AFTER INSERT ON `datasets` BEGIN UPDATE `manuscripts` SET `review_stamp` = `review_stamp` + 1 WHERE `id` IN (NEW.`manuscript_id`); END;
--> statement-breakpoint
CREATE TRIGGER `datasets_update_review_stamp` AFTER UPDATE ON `datasets` BEGIN UPDATE `manuscripts` SET `review_stamp` = `review_stamp` + 1 WHERE `id` IN (OLD.`manuscript_id`, NEW.`manuscript_id`); END;
--> statement-breakpoint
CREATE TRIGGER `datasets_delete_review_stamp` AFTER DELETE ON `datasets` BEGIN UPDATE `manuscripts` SET `review_stamp` = `review_stamp` + 1 WHERE `id` IN (OLD.`manuscript_id`); END;
--> statement-breakpoint
CREATE TRIGGER `users_update_review_stamp` AFTER UPDATE OF `name`, `email` ON `users` BEGIN UPDATE `manuscripts` SET `review_stamp` = `review_stamp` + 1 WHERE `id` IN (SELECT `manuscript_id` FROM `manuscript_members` WHERE `user_id` = NEW.`id`); END;
