-- Foods in the words a dietitian writes. A food's name is now its everyday
-- name ("White rice, boiled"); the composition table's own name ("Rice, raw,
-- milled") is kept beside it as source_name, with its code in source. A food
-- eaten cooked but listed in the table as weighed dry or raw (rice, dals,
-- quinoa, vermicelli) carries cooked_yield, the grams as eaten per gram as
-- weighed in the table, so that suggestions say "about 310 g cooked (120 g
-- uncooked)" while its figures stay the table's per 100 g as weighed.
-- Household portions lose their weight in brackets, which the suggestion
-- now gives in full (and in ml for drinks, 1 g taken as 1 ml).
--
-- Cooked yields, from memory of common household figures (a cup of boiled
-- rice about 160 g; rice and cereals take up about 1.5 times their weight of
-- water when boiled; pulses about 1.5): white, parboiled and brown rice 2.6,
-- vermicelli 2.3, quinoa 2.7, dals and kidney beans 2.5. A practice that
-- weighs its own may change them on the food's form.
--
-- A dietitian's food line (plan_feed_choices) is given as eaten too: its
-- unit says grams, ml or grams cooked.
--
-- Only rows still as seeded are changed (the table's code and name), and a
-- row whose new name another active food already has keeps its old one.

-- +goose Up
ALTER TABLE foods
    ADD COLUMN source_name text NOT NULL DEFAULT '' CHECK (length(source_name) <= 200),
    ADD COLUMN cooked_yield numeric(4,2) CHECK (cooked_yield IS NULL OR cooked_yield BETWEEN 1 AND 10);

UPDATE foods f SET source_name = f.name, name = n.everyday, portion_name = n.portion, portion_g = n.portion_g,
    cooked_yield = n.yield, updated_at = now()
FROM (VALUES
    ('A011', 'Rice flakes', 'Flattened rice (poha), dry', '1 cup, dry', 30, NULL),
    ('A012', 'Rice puffed', 'Puffed rice', '1 cup', 15, NULL),
    ('A013', 'Rice, raw, brown', 'Brown rice, boiled', '1 cup, cooked', 60, 2.6),
    ('A014', 'Rice, parboiled, milled', 'Parboiled rice, boiled', '1 cup, cooked', 60, 2.6),
    ('A015', 'Rice, raw, milled', 'White rice, boiled', '1 cup, cooked', 60, 2.6),
    ('A018', 'Wheat flour, refined', 'Refined wheat flour (maida)', 'flour for 1 flatbread', 30, NULL),
    ('A019', 'Wheat flour, atta', 'Whole-wheat flour (atta)', 'flour for 1 chapati', 30, NULL),
    ('A022', 'Wheat, semolina', 'Semolina (rava), dry', '3 tablespoons, dry', 30, NULL),
    ('A023', 'Wheat, vermicelli', 'Vermicelli, boiled', '1 cup, cooked', 60, 2.3),
    ('A010', 'Ragi', 'Finger millet (ragi) flour', 'flour for 1 roti', 30, NULL),
    ('A005', 'Jowar', 'Sorghum (jowar) flour', 'flour for 1 roti', 30, NULL),
    ('A009', 'Quinoa', 'Quinoa, boiled', '½ cup, cooked', 35, 2.7),
    ('B001', 'Bengal gram, dal', 'Chana dal, boiled', '½ cup, cooked', 40, 2.5),
    ('B010', 'Green gram, dal', 'Moong dal, boiled', '½ cup, cooked', 40, 2.5),
    ('B013', 'Lentil dal', 'Red lentils (masoor dal), boiled', '½ cup, cooked', 40, 2.5),
    ('B021', 'Red gram, dal', 'Toor dal, boiled', '½ cup, cooked', 40, 2.5),
    ('B020', 'Rajmah, red', 'Red kidney beans, boiled', '½ cup, cooked', 35, 2.5),
    ('E012', 'Banana, ripe, robusta', 'Banana', '1 medium, peeled', 100, NULL),
    ('E017', 'Dates, dry, pale brown', 'Dates, dried', '1 date, pitted', 8, NULL),
    ('E057', 'Raisins, dried, black', 'Raisins', '1 tablespoon', 10, NULL),
    ('E047', 'Orange, pulp', 'Orange', '1 medium, peeled', 130, NULL),
    ('E053', 'Pineapple', 'Pineapple', '1 cup of pieces', 150, NULL),
    ('E039', 'Mango, ripe, kesar', 'Mango', '1 cup of pieces', 150, NULL),
    ('E065', 'Water melon, dark green (sugar baby)', 'Watermelon', '1 cup of pieces', 150, NULL),
    ('E025', 'Grapes, seedless, oval, black', 'Grapes, black, seedless', '1 cup', 150, NULL),
    ('F006', 'Potato, brown skin, big', 'Potato', '1 medium', 150, NULL),
    ('F013', 'Sweet potato, brown skin', 'Sweet potato', '1 medium', 130, NULL),
    ('I001', 'Jaggery, cane', 'Jaggery', '1 piece', 10, NULL),
    ('I002', 'Sugarcane, juice', 'Sugarcane juice', '1 glass', 250, NULL),
    ('K002', 'Coconut Water', 'Coconut water', '1 glass', 250, NULL),
    ('L002', 'Milk, whole, Cow', 'Cow''s milk, whole', '1 glass', 250, NULL),
    ('L001', 'Milk, whole, Buffalo', 'Buffalo milk, whole', '1 glass', 250, NULL),
    ('L003', 'Paneer', 'Paneer', '1 serving', 50, NULL),
    ('M004', 'Egg, poultry, whole, boiled', 'Egg, boiled', '1 egg', 50, NULL),
    ('N003', 'Chicken, poultry, breast, skinless', 'Chicken breast, skinless', '1 piece', 100, NULL),
    ('P084', 'Tuna', 'Tuna', '1 serving', 100, NULL),
    ('H012', 'Ground nut', 'Peanuts', '1 handful', 30, NULL),
    ('H001', 'Almond', 'Almonds', '10 almonds', 12, NULL)
) AS n (code, seeded, everyday, portion, portion_g, yield)
WHERE f.source = n.code AND f.name = n.seeded
  AND NOT EXISTS (SELECT 1 FROM foods o WHERE o.id <> f.id AND o.archived_at IS NULL AND lower(o.name) = lower(n.everyday));

ALTER TABLE plan_feed_choices
    ADD COLUMN unit text NOT NULL DEFAULT 'g' CHECK (unit IN ('g', 'ml', 'g cooked'));

-- +goose Down
ALTER TABLE plan_feed_choices DROP COLUMN unit;
UPDATE foods SET name = source_name WHERE source_name <> ''
  AND NOT EXISTS (SELECT 1 FROM foods o WHERE o.id <> foods.id AND o.archived_at IS NULL AND lower(o.name) = lower(foods.source_name));
ALTER TABLE foods DROP COLUMN cooked_yield, DROP COLUMN source_name;
