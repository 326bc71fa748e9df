-- The viewer's time zone (an IANA name such as Europe/Berlin), chosen on the account page; NULL means the
-- installation's zone (roundtable.display.time-zone). Pages and e-mails show times in it, with the zone named.
ALTER TABLE app_user ADD COLUMN time_zone varchar(64);
