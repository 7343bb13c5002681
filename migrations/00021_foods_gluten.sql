-- Foods: a contains_gluten flag, so that food suggestions for a client whose
-- recorded cautions mention coeliac disease or gluten leave such foods out.
-- Set here for the seeded IFCT 2017 rows (Longvah T et al., National Institute
-- of Nutrition, Hyderabad) made from wheat, barley or rye (A018 refined wheat
-- flour, A019 atta, A022 semolina, A023 vermicelli; any other row whose name
-- says wheat, semolina, vermicelli, barley, rye and the like) and for
-- oats: oats are counted as gluten-containing unless certified gluten-free,
-- as is common practice, because they are usually contaminated with wheat.
-- Rice, millets (ragi, jowar), quinoa, pulses, fruit, roots, sugars and milk
-- are gluten-free as foods. The practice's own products are flagged from
-- their labels in the app.

-- +goose Up
ALTER TABLE foods ADD COLUMN contains_gluten boolean NOT NULL DEFAULT false;

-- Rows a practice has already added are matched by name (whole words, so
-- buckwheat is not wheat), except those that say they are gluten-free.
UPDATE foods SET contains_gluten = true
WHERE source IN ('A018', 'A019', 'A022', 'A023')
   OR (name ~* '\m(wheat|semolina|suji|sooji|rava|vermicelli|maida|atta|barley|rye|oats?|oatmeal|muesli|spelt|bulgur|couscous|seitan|bread|pasta)\M'
       AND name !~* 'gluten[- ]?free');

-- +goose Down
ALTER TABLE foods DROP COLUMN contains_gluten;
