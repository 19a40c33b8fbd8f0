-- The review audit trail is append-only: refuse UPDATE and DELETE on review_events whoever asks,
-- so not even a bug in the API (or a hand-written query) can rewrite who decided what and when.
CREATE FUNCTION review_events_refuse_change() RETURNS trigger
LANGUAGE plpgsql AS $$
BEGIN
  RAISE EXCEPTION 'review_events is append-only: % is not allowed', TG_OP
    USING ERRCODE = 'insufficient_privilege';
END;
$$;
--> statement-breakpoint
CREATE TRIGGER review_events_append_only
  BEFORE UPDATE OR DELETE ON review_events
  FOR EACH ROW EXECUTE FUNCTION review_events_refuse_change();
--> statement-breakpoint
-- The board summary's factors ship as illustrative placeholders for an admin to replace (with
-- their sources) under Settings; ON CONFLICT keeps whatever an admin has already set.
INSERT INTO network_settings (key, energy_tariff_per_k_wh, currency, tariff_source, grid_emission_factor_kg_per_k_wh, emission_factor_source)
VALUES (
  'network',
  0.2,
  'EUR',
  'Illustrative placeholder, not a real tariff: replace with the price per kWh of your electricity contract and name it here.',
  0.3,
  'Illustrative placeholder, from memory and not checked: grid averages in Europe are of the order of 0.2–0.4 kg CO2 per kWh. Replace with your supplier''s or the national figure for the year and name its source here.'
)
ON CONFLICT (key) DO NOTHING;
