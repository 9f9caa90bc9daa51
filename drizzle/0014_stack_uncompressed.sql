-- A stack is stored out of line without compression: compressing up to 1 MB of measured values
-- on every save of a draft cost more time than the disk it saves is worth (docs/security.md).
ALTER TABLE "stack_revisions" ALTER COLUMN "stack" SET STORAGE EXTERNAL;
