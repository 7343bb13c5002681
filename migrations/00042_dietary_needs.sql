-- Dietary needs as data. A client's needs are codes (gluten-free,
-- lactose-free, milk-protein-free, no tree nuts, no peanuts, no egg, no soy,
-- no fish or shellfish, vegetarian, vegan, no pork, no alcohol, low FODMAP)
-- plus a free-text line; each food carries the dietary facts those needs
-- are checked against (what it contains), so that a suggestion never breaks
-- a recorded need. A food whose facts nobody has recorded is left out for
-- any need but gluten-free (its gluten flag has been kept since the foods
-- list began): nothing is known to be safe.
--
-- Until the dietitian confirms a client's needs once
-- (dietary_needs_confirmed_at), the needs that the recorded cautions seem
-- to name are applied as well, and the client page offers to record them.
--
-- Facts of the seeded rows of the Indian Food Composition Tables 2017
-- (Longvah T et al., National Institute of Nutrition, Hyderabad), by food
-- code: milk (L001, L002) and paneer (L003) carry lactose and milk protein;
-- egg (M004), chicken (N003) and tuna (P084) are of animal origin;
-- groundnut (H012) is a peanut and almond (H001) a tree nut; wheat foods
-- already carry gluten. High FODMAP at the portions listed (common
-- practice, from memory; defer to a dietitian trained in the diet): wheat
-- and semolina (fructans), pulses (galacto-oligosaccharides), milk and
-- paneer (lactose), mango and watermelon (excess fructose), ripe banana,
-- dates and raisins (fructans), sweet potato (mannitol), coconut water
-- (sorbitol, at a glass), almonds (at more than about ten).

-- +goose Up
ALTER TABLE clients
    ADD COLUMN dietary_needs text[] NOT NULL DEFAULT '{}'
        CHECK (dietary_needs <@ ARRAY['gluten_free', 'lactose_free', 'milk_protein_free', 'no_nuts', 'no_peanuts', 'no_egg',
            'no_soy', 'no_fish_shellfish', 'vegetarian', 'vegan', 'no_pork', 'no_alcohol', 'low_fodmap']::text[]),
    ADD COLUMN dietary_needs_other text NOT NULL DEFAULT '' CHECK (length(dietary_needs_other) <= 1000),
    ADD COLUMN dietary_needs_confirmed_at timestamptz,
    -- optimistic locking of the dietary-needs form
    ADD COLUMN dietary_needs_revision integer NOT NULL DEFAULT 0;

ALTER TABLE foods
    ADD COLUMN facts text[] NOT NULL DEFAULT '{}'
        CHECK (facts <@ ARRAY['gluten', 'lactose', 'milk_protein', 'tree_nuts', 'peanuts', 'egg', 'soy', 'fish_shellfish',
            'meat', 'animal', 'pork', 'alcohol', 'high_fodmap']::text[]),
    ADD COLUMN facts_recorded boolean NOT NULL DEFAULT false;

UPDATE foods SET facts = CASE source
        WHEN 'A018' THEN ARRAY['gluten', 'high_fodmap']
        WHEN 'A019' THEN ARRAY['gluten', 'high_fodmap']
        WHEN 'A022' THEN ARRAY['gluten', 'high_fodmap']
        WHEN 'A023' THEN ARRAY['gluten', 'high_fodmap']
        WHEN 'B001' THEN ARRAY['high_fodmap']
        WHEN 'B010' THEN ARRAY['high_fodmap']
        WHEN 'B013' THEN ARRAY['high_fodmap']
        WHEN 'B020' THEN ARRAY['high_fodmap']
        WHEN 'B021' THEN ARRAY['high_fodmap']
        WHEN 'E012' THEN ARRAY['high_fodmap']
        WHEN 'E017' THEN ARRAY['high_fodmap']
        WHEN 'E057' THEN ARRAY['high_fodmap']
        WHEN 'E039' THEN ARRAY['high_fodmap']
        WHEN 'E065' THEN ARRAY['high_fodmap']
        WHEN 'F013' THEN ARRAY['high_fodmap']
        WHEN 'K002' THEN ARRAY['high_fodmap']
        WHEN 'L001' THEN ARRAY['lactose', 'milk_protein', 'animal', 'high_fodmap']
        WHEN 'L002' THEN ARRAY['lactose', 'milk_protein', 'animal', 'high_fodmap']
        WHEN 'L003' THEN ARRAY['lactose', 'milk_protein', 'animal', 'high_fodmap']
        WHEN 'M004' THEN ARRAY['egg', 'animal']
        WHEN 'N003' THEN ARRAY['meat', 'animal']
        WHEN 'P084' THEN ARRAY['fish_shellfish', 'animal']
        WHEN 'H012' THEN ARRAY['peanuts']
        WHEN 'H001' THEN ARRAY['tree_nuts', 'high_fodmap']
        ELSE '{}'::text[] END,
    facts_recorded = true
WHERE source IN ('A011', 'A012', 'A013', 'A014', 'A015', 'A018', 'A019', 'A022', 'A023', 'A010', 'A005', 'A009',
    'B001', 'B010', 'B013', 'B021', 'B020', 'E012', 'E017', 'E057', 'E047', 'E053', 'E039', 'E065', 'E025',
    'F006', 'F013', 'I001', 'I002', 'K002', 'L002', 'L001', 'L003', 'M004', 'N003', 'P084', 'H012', 'H001');
UPDATE foods SET facts = array_append(facts, 'gluten') WHERE contains_gluten AND facts_recorded AND NOT 'gluten' = ANY (facts);

-- +goose Down
ALTER TABLE foods DROP COLUMN facts_recorded, DROP COLUMN facts;
ALTER TABLE clients DROP COLUMN dietary_needs_revision, DROP COLUMN dietary_needs_confirmed_at,
    DROP COLUMN dietary_needs_other, DROP COLUMN dietary_needs;
