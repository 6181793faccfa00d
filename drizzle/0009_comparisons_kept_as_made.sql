-- A comparison is kept as it was made, with the statement version it used: no UPDATE, whoever writes.
-- (Rows still go with their person's account, through the foreign key's ON DELETE CASCADE.)
CREATE TRIGGER comparisons_no_update BEFORE UPDATE ON comparisons
BEGIN
  SELECT RAISE(ABORT, 'comparisons are kept as made');
END;
