-- The parts each service uses feed the parts forecast, which is kept against the fleet's data
-- version: a change to them moves it on like any other write to the fleet's data.
CREATE TRIGGER "service_item_parts_data_changed" AFTER INSERT OR UPDATE OR DELETE OR TRUNCATE ON "service_item_parts" FOR EACH STATEMENT EXECUTE FUNCTION "lashline_data_changed"('fleet');
