-- Messages already sent or given up kept their invitation and reset links in plain text; those
-- links are the recipients' alone, so their tokens are masked in what the outbox keeps.
-- (Queued messages keep theirs: they still have to be delivered as they are.)
UPDATE "mail_outbox"
SET "text_body" = regexp_replace("text_body", '([?&]token=)[A-Za-z0-9_-]+', '\1••••••', 'g')
WHERE "status" <> 'queued' AND "text_body" ~ '[?&]token=';
