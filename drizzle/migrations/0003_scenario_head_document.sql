-- The scenario row kept a copy of its head revision's document, which could be changed behind the
-- revision (and so behind a sign-off). Readers now take the head revision's own document.
ALTER TABLE "scenarios" DROP COLUMN "document";
